//! Shards: part K of N (K from 0) holds the cases with `case_id % N == K`, so every part gets a mix of the sweep.

use std::fmt;

/// One of N interleaved parts of a sweep: the cases with `case_id % count == index`.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Shard {
    /// Which part, from 0.
    pub index: u64,
    /// How many parts.
    pub count: u64,
}

impl Default for Shard {
    fn default() -> Self {
        Shard::WHOLE
    }
}

impl fmt::Display for Shard {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}/{}", self.index, self.count)
    }
}

/// Largest number of shards.
pub const MAX_SHARDS: u64 = 1_000_000;

impl Shard {
    /// The whole sweep (shard 0 of 1).
    pub const WHOLE: Shard = Shard { index: 0, count: 1 };

    /// A shard, checked: 1 ≤ count ≤ [`MAX_SHARDS`] and index < count.
    pub fn new(index: u64, count: u64) -> Result<Shard, String> {
        if count == 0 || count > MAX_SHARDS {
            return Err(format!("the number of shards must be between 1 and {MAX_SHARDS}, not {count}"));
        }
        if index >= count {
            return Err(format!("shard index {index} is not below the number of shards {count} (indices start at 0)"));
        }
        Ok(Shard { index, count })
    }

    /// Parse `K/N` (K from 0).
    pub fn parse(text: &str) -> Result<Shard, String> {
        let (k, n) = text.trim().split_once('/').ok_or_else(|| format!("cannot read shard '{text}': use K/N with K from 0, e.g. 0/4"))?;
        let k: u64 = k.trim().parse().map_err(|_| format!("cannot read shard '{text}': '{}' is not a whole number", k.trim()))?;
        let n: u64 = n.trim().parse().map_err(|_| format!("cannot read shard '{text}': '{}' is not a whole number", n.trim()))?;
        Shard::new(k, n)
    }

    /// True for the whole sweep (N = 1).
    pub fn is_whole(&self) -> bool {
        self.count == 1
    }

    /// Number of cases of a sweep of `total` cases that fall in this shard.
    pub fn len_of(&self, total: u64) -> u64 {
        if self.index >= total {
            0
        } else {
            (total - self.index - 1) / self.count + 1
        }
    }

    /// Case id of the shard's `position`-th case (from 0).
    pub fn case_id(&self, position: u64) -> u64 {
        self.index + position * self.count
    }

    /// The shard of a Slurm job-array task, from the task's environment (`lookup` returns a variable's value).
    ///
    /// Uses `SLURM_ARRAY_TASK_ID`, `SLURM_ARRAY_TASK_COUNT`, and `SLURM_ARRAY_TASK_MIN` / `SLURM_ARRAY_TASK_STEP`
    /// when set (arrays need not start at 0): K = (ID − MIN) / STEP, N = COUNT. None outside a job array.
    pub fn from_slurm(lookup: impl Fn(&str) -> Option<String>) -> Result<Option<Shard>, String> {
        let (Some(id), Some(count)) = (lookup("SLURM_ARRAY_TASK_ID"), lookup("SLURM_ARRAY_TASK_COUNT")) else {
            return Ok(None);
        };
        let num = |name: &str, v: &str| -> Result<u64, String> { v.trim().parse::<u64>().map_err(|_| format!("{name}='{v}' is not a whole number")) };
        let id = num("SLURM_ARRAY_TASK_ID", &id)?;
        let count = num("SLURM_ARRAY_TASK_COUNT", &count)?;
        let min = match lookup("SLURM_ARRAY_TASK_MIN") {
            Some(v) => num("SLURM_ARRAY_TASK_MIN", &v)?,
            None => 0,
        };
        let step = match lookup("SLURM_ARRAY_TASK_STEP") {
            Some(v) => num("SLURM_ARRAY_TASK_STEP", &v)?.max(1),
            None => 1,
        };
        if id < min || (id - min) % step != 0 {
            return Err(format!("SLURM_ARRAY_TASK_ID={id} does not fit an array starting at {min} with step {step}; pass --shard K/N"));
        }
        Shard::new((id - min) / step, count).map(Some).map_err(|e| format!("Slurm job array (task {id}, {count} tasks, first {min}): {e}; pass --shard K/N"))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn lengths_cover_all_cases_once() {
        for total in [0u64, 1, 5, 12, 13] {
            for n in [1u64, 2, 3, 7, 20] {
                let mut ids: Vec<u64> = (0..n).flat_map(|k| {
                    let s = Shard::new(k, n).unwrap();
                    (0..s.len_of(total)).map(move |p| s.case_id(p))
                }).collect();
                ids.sort_unstable();
                assert_eq!(ids, (0..total).collect::<Vec<_>>(), "total {total}, n {n}");
            }
        }
    }

    #[test]
    fn parse_and_slurm() {
        assert_eq!(Shard::parse("2/7").unwrap(), Shard { index: 2, count: 7 });
        assert!(Shard::parse("7/7").is_err());
        assert!(Shard::parse("x").is_err());
        fn env<'a>(pairs: &'a [(&'a str, &'a str)]) -> impl Fn(&str) -> Option<String> + 'a {
            move |k: &str| pairs.iter().find(|(n, _)| *n == k).map(|(_, v)| v.to_string())
        }
        assert_eq!(Shard::from_slurm(env(&[])).unwrap(), None);
        assert_eq!(Shard::from_slurm(env(&[("SLURM_ARRAY_TASK_ID", "3"), ("SLURM_ARRAY_TASK_COUNT", "4")])).unwrap(), Some(Shard { index: 3, count: 4 }));
        let offset: [(&str, &str); 3] = [("SLURM_ARRAY_TASK_ID", "12"), ("SLURM_ARRAY_TASK_COUNT", "4"), ("SLURM_ARRAY_TASK_MIN", "10")];
        assert_eq!(Shard::from_slurm(env(&offset)).unwrap(), Some(Shard { index: 2, count: 4 }));
        let stepped: [(&str, &str); 4] = [("SLURM_ARRAY_TASK_ID", "14"), ("SLURM_ARRAY_TASK_COUNT", "4"), ("SLURM_ARRAY_TASK_MIN", "10"), ("SLURM_ARRAY_TASK_STEP", "2")];
        assert_eq!(Shard::from_slurm(env(&stepped)).unwrap(), Some(Shard { index: 2, count: 4 }));
        assert!(Shard::from_slurm(env(&[("SLURM_ARRAY_TASK_ID", "9"), ("SLURM_ARRAY_TASK_COUNT", "4")])).is_err());
    }
}
