//! Radial finite-volume transport inside a spherical droplet, in the normalised mass coordinate η = M(r)/m
//! (M = liquid mass inside radius r, m = droplet mass), with one backward-Euler (implicit) step solved by the
//! Thomas algorithm. The same step serves species diffusion and heat conduction (docs/model.md §liquid).
//!
//! Cell balance for cell j between faces η_a < η_b (mass m Δη_j), for a transported quantity u (mass
//! fraction, or temperature with constant cp):
//!   m' Δη u' − m Δη u = Δt [ (J_a + η_a ṁ u_up(a)) − (J_b + η_b ṁ u_up(b)) ],
//! where J_f = G_f (u_in − u_out) is the diffusive/conductive outward flux, G_f = ρ² κ A_f² / (m δη_f), and
//! η_f ṁ is the mass crossing a fixed-η face as the surface recedes (ṁ > 0 evaporating; upwind u). At the
//! surface the outward conductive flux equals −q_in(u_s), with q_in linear in the surface value u_s.

use crate::numerics::root::{brent, Tolerance};

/// Faces and centres of a radial grid in η, clustered at the surface.
#[derive(Debug, Clone)]
pub struct RadialGrid {
    /// Cell faces η_0 = 0 < … < η_n = 1.
    pub faces: Vec<f64>,
    /// Cell centres (mass midpoints).
    pub centres: Vec<f64>,
    /// Cell widths Δη.
    pub widths: Vec<f64>,
    /// Conductance factors per face (index 1..=n), see [`RadialGrid::face_factor`].
    factors: Vec<f64>,
    /// Linear-interpolation weight of the inner cell at each face (index 1..n−1), for the central scheme.
    inner_weights: Vec<f64>,
    a: Vec<f64>,
    b: Vec<f64>,
    c: Vec<f64>,
    d: Vec<f64>,
    cp: Vec<f64>,
    /// Storage coefficients m_old Δη_j / Δt of a multi-column step (scratch).
    storage: Vec<f64>,
    /// Weights of the old cell values in the last inner forward-eliminated value of a surface-only step (scratch).
    gamma: Vec<f64>,
    /// Interleaved columns of a multi-column step, `LANES` values per cell (scratch).
    work: Vec<f64>,
}

/// Columns swept side by side by [`RadialGrid::implicit_step_many`] (independent recurrences whose divisions
/// overlap in the floating-point unit).
pub const LANES: usize = 8;

/// Linear heat/species input at the surface: q_in(u_s) = q0 + q1 (u_s − u_ref).
#[derive(Debug, Clone, Copy)]
pub struct SurfaceInput {
    /// Value at u_s = u_ref.
    pub q0: f64,
    /// Slope dq_in/du_s.
    pub q1: f64,
    /// Reference surface value.
    pub u_ref: f64,
}

impl RadialGrid {
    /// A grid of `n` cells with faces ζ_j = 1 − (1 − j/n)² in normalised radius (fine at the surface), η = ζ³.
    /// With n = 1 the grid is one well-mixed cell.
    pub fn new(n: usize) -> Self {
        let n = n.max(1);
        let faces: Vec<f64> = (0..=n)
            .map(|j| {
                let s = j as f64 / n as f64;
                let zeta = if n == 1 { s } else { 1.0 - (1.0 - s) * (1.0 - s) };
                zeta * zeta * zeta
            })
            .collect();
        let centres: Vec<f64> = faces.windows(2).map(|w| 0.5 * (w[0] + w[1])).collect();
        let widths: Vec<f64> = faces.windows(2).map(|w| w[1] - w[0]).collect();
        let centres: Vec<f64> = centres;
        let factors = (0..=n)
            .map(|f| {
                if f == 0 {
                    return 0.0;
                }
                let area2 = faces[f].powf(4.0 / 3.0);
                let delta = if f == n { 1.0 - centres[n - 1] } else { centres[f] - centres[f - 1] };
                area2 / delta
            })
            .collect();
        let inner_weights = (0..=n).map(|f| if f == 0 || f == n { 1.0 } else { (centres[f] - faces[f]) / (centres[f] - centres[f - 1]) }).collect();
        RadialGrid { faces, centres, widths, factors, inner_weights, a: vec![0.0; n + 1], b: vec![0.0; n + 1], c: vec![0.0; n + 1], d: vec![0.0; n + 1], cp: vec![0.0; n + 1], storage: vec![0.0; n + 1], gamma: vec![0.0; n + 1], work: vec![0.0; (n + 1) * LANES] }
    }

    /// Number of cells.
    pub fn len(&self) -> usize {
        self.widths.len()
    }

    /// True for an empty grid (never).
    pub fn is_empty(&self) -> bool {
        self.widths.is_empty()
    }

    /// Conductance factor of face f (1 ≤ f ≤ n): multiply by ρ² κ A_s² / m, where A_s is the surface area,
    /// to get G_f. Uses A_f/A_s = η_f^(2/3) and δη between the neighbouring centres (half cell at the surface).
    #[inline]
    pub fn face_factor(&self, f: usize) -> f64 {
        self.factors[f]
    }

    /// Tridiagonal coefficients (a, b, c) of all rows for diffusion plus the grid-relative advection of a
    /// receding surface, without the surface exchange of the last row. Each inner face is evaluated once and
    /// added to its two cells (the inner-face term of a cell before its outer-face term, as row by row): one
    /// pass over the faces, each cell's diagonal carried from its inner face to its outer face.
    fn assemble(&mut self, m_new: f64, dt: f64, g_scale: f64, mdot: f64) {
        let n = self.len();
        let (a, b, c) = (&mut self.a[..n], &mut self.b[..n], &mut self.c[..n]);
        let (faces, factors, inner_weights, widths) = (&self.faces[..n], &self.factors[..n], &self.inner_weights[..n], &self.widths[..n]);
        a[0] = 0.0;
        // diagonal of the cell inside the current face: its storage term, then its inner-face term
        let mut b_inner = m_new * widths[0] / dt;
        // face f between cell f−1 and cell f; flow = mass crossing outward
        let cells_out = b[..n - 1].iter_mut().zip(c[..n - 1].iter_mut());
        let faces_f = faces[1..].iter().zip(&factors[1..]).zip(inner_weights[1..].iter().zip(&widths[1..]));
        for (((b_out, c_out), a_in), ((&face, &factor), (&inner_weight, &width))) in cells_out.zip(a[1..].iter_mut()).zip(faces_f) {
            let g = g_scale * factor;
            let flow = face * mdot;
            // Spalding's hybrid scheme (Patankar 1980 §5.2): central interpolation while the face Péclet number
            // |flow|/G ≤ 2, upwind above
            let w = if flow.abs() <= 2.0 * g {
                inner_weight
            } else if flow >= 0.0 {
                1.0
            } else {
                0.0
            };
            // outflow of cell f−1 through its outer face: J + flow·u_f, J = g (u_{f−1} − u_f), u_f = w u_{f−1} + (1 − w) u_f
            let out_inner = g + flow * w;
            let out_outer = flow * (1.0 - w);
            *b_out = b_inner + out_inner;
            // `0.0 + …` and `0.0 − …`: the coefficients as accumulated from zero (a −0.0 term gives +0.0), the
            // bits of the row-by-row assembly
            *c_out = 0.0 + (-g + out_outer);
            // inflow of cell f through its inner face
            *a_in = 0.0 - out_inner;
            b_inner = m_new * width / dt + (g - out_outer);
        }
        b[n - 1] = b_inner;
        c[n - 1] = 0.0;
    }

    /// One implicit step. `u` holds cell values at the old time and receives the new ones; `m_old`, `m_new`
    /// droplet masses; `g_scale` = ρ² κ A_s² / m (same for all faces); `mdot` evaporation rate (kg/s, >0
    /// evaporating); `input` the surface input (heat in /cp, or species). Returns the new surface value u_s.
    #[allow(clippy::too_many_arguments)] // one implicit step of the discretised equation: its inputs, named
    pub fn implicit_step(&mut self, u: &mut [f64], m_old: f64, m_new: f64, dt: f64, g_scale: f64, mdot: f64, input: SurfaceInput) -> f64 {
        let n = self.len();
        if n == 1 {
            // well-mixed: m' u' − m u = Δt [ −(−q_in(u')) − ṁ u' ]... surface value = cell value
            // outflow = J_s + ṁ u_s with J_s = −q_in(u_s), u_s = u'
            // m' u' − m u = −Δt (−q0 − q1 (u' − u_ref) + ṁ u')
            let lhs = m_new + dt * (mdot - input.q1);
            let rhs = m_old * u[0] + dt * (input.q0 - input.q1 * input.u_ref);
            u[0] = rhs / lhs;
            return u[0];
        }
        // surface reconstruction: G_s (u_N − u_s) = −q_in(u_s) ⇒ u_s = α u_N + β
        let g_s = g_scale * self.face_factor(n);
        let den = g_s - input.q1;
        let alpha = g_s / den;
        let beta = (input.q0 - input.q1 * input.u_ref) / den;
        self.assemble(m_new, dt, g_scale, mdot);
        let last = n - 1;
        let u = &mut u[..n];
        let (a, b, c, widths) = (&self.a[..n], &self.b[..n], &self.c[..n], &self.widths[..n]);
        let (cp, d) = (&mut self.cp[..n], &mut self.d[..n]);
        // Thomas algorithm, forward elimination (right-hand side m_old Δη u / Δt); the pivots and eliminated
        // right-hand sides carried from row to row
        let mut cp_prev = c[0] / b[0];
        let mut d_prev = m_old * widths[0] * u[0] / dt / b[0];
        cp[0] = cp_prev;
        d[0] = d_prev;
        let rows = a[1..last].iter().zip(&b[1..last]).zip(c[1..last].iter().zip(&widths[1..last]));
        for ((((&aj, &bj), (&cj, &wj)), &uj), (cpj, dj)) in rows.zip(&u[1..last]).zip(cp[1..last].iter_mut().zip(d[1..last].iter_mut())) {
            let m = bj - aj * cp_prev;
            cp_prev = cj / m;
            d_prev = (m_old * wj * uj / dt - aj * d_prev) / m;
            *cpj = cp_prev;
            *dj = d_prev;
        }
        // surface row: outflow = G_s (u_N − u_s) + ṁ u_s, with u_s = α u_N + β
        let b_last = b[last] + (g_s * (1.0 - alpha) + mdot * alpha);
        let d_last = m_old * widths[last] * u[last] / dt - (mdot - g_s) * beta;
        let m = b_last - a[last] * cp_prev;
        let mut next = (d_last - a[last] * d_prev) / m;
        u[last] = next;
        for (uj, (&dj, &cpj)) in u[..last].iter_mut().zip(d[..last].iter().zip(&cp[..last])).rev() {
            *uj = dj - cpj * next;
            next = *uj;
        }
        alpha * u[last] + beta
    }

    /// Implicit step for several quantities that share the grid, transport coefficients and advection and
    /// differ only in their surface input (the species of a mixture): the tridiagonal matrix is factored once,
    /// and the sweeps run over groups of up to [`LANES`] columns side by side, interleaved in a scratch buffer
    /// (independent recurrences, the same operations in the same order per column as one column alone).
    /// `u` is component-major (`u\[i * n + j\]`); the new surface values go to `surface`.
    #[allow(clippy::too_many_arguments)]
    pub fn implicit_step_many(&mut self, u: &mut [f64], m_old: f64, m_new: f64, dt: f64, g_scale: f64, mdot: f64, inputs: &[SurfaceInput], surface: &mut [f64]) {
        self.implicit_step_columns(None, u, m_old, m_new, dt, g_scale, mdot, inputs, surface, true);
    }

    /// [`RadialGrid::implicit_step_many`] from the old values `old` to the new ones `new` (same layout; the same
    /// bits as the step in place).
    #[allow(clippy::too_many_arguments)]
    pub fn implicit_step_many_from(&mut self, old: &[f64], new: &mut [f64], m_old: f64, m_new: f64, dt: f64, g_scale: f64, mdot: f64, inputs: &[SurfaceInput], surface: &mut [f64]) {
        self.implicit_step_columns(Some(old), new, m_old, m_new, dt, g_scale, mdot, inputs, surface, true);
    }

    /// [`RadialGrid::implicit_step_many_from`] for the surface values alone: the forward elimination only, which
    /// gives the new outer-cell value of each column (written to `new\[i * n + n − 1\]`, the same bits as the full
    /// step) and the surface value; the other cells of `new` do not hold the step's values afterwards.
    #[allow(clippy::too_many_arguments)]
    pub fn implicit_surface_many_from(&mut self, old: &[f64], new: &mut [f64], m_old: f64, m_new: f64, dt: f64, g_scale: f64, mdot: f64, inputs: &[SurfaceInput], surface: &mut [f64]) {
        self.implicit_step_columns(Some(old), new, m_old, m_new, dt, g_scale, mdot, inputs, surface, false);
    }

    /// The multi-column step from `old` (None: from `u` itself) into `u`, with the back substitution (`full`) or
    /// without it (surface values and outer cells).
    #[allow(clippy::too_many_arguments)]
    fn implicit_step_columns(&mut self, old: Option<&[f64]>, u: &mut [f64], m_old: f64, m_new: f64, dt: f64, g_scale: f64, mdot: f64, inputs: &[SurfaceInput], surface: &mut [f64], full: bool) {
        let n = self.len();
        let count = inputs.len();
        if n == 1 {
            if let Some(old) = old {
                u[..count].copy_from_slice(&old[..count]);
            }
            for (k, input) in inputs.iter().enumerate() {
                surface[k] = self.implicit_step(&mut u[k..k + 1], m_old, m_new, dt, g_scale, mdot, *input);
            }
            return;
        }
        // shared rows (all but the surface row): coefficients and forward elimination factors
        self.assemble(m_new, dt, g_scale, mdot);
        // factors: cp[j] = c[j]/m_j and the pivots m_j kept in d (rows 0..n−2)
        self.cp[0] = self.c[0] / self.b[0];
        self.d[0] = self.b[0];
        for j in 1..n - 1 {
            let piv = self.b[j] - self.a[j] * self.cp[j - 1];
            self.d[j] = piv;
            self.cp[j] = self.c[j] / piv;
        }
        let scale_old = m_old / dt;
        for (s, w) in self.storage[..n].iter_mut().zip(&self.widths[..n]) {
            *s = scale_old * w;
        }
        if !full {
            self.outer_cells_only(old, u, g_scale, mdot, inputs, surface);
            return;
        }
        let mut work = std::mem::take(&mut self.work);
        work.resize(n * LANES, 0.0);
        let sweep = self.sweep(g_scale, mdot, full);
        let (u, surface) = (&mut u[..count * n], &mut surface[..count]);
        // groups of LANES columns, then of four, then single columns (`source` of a group: its old values)
        let wide_len = count / LANES * LANES * n;
        let (wide, rest) = u.split_at_mut(wide_len);
        for (g, ((cols, inputs), surface)) in wide.chunks_exact_mut(LANES * n).zip(inputs.chunks_exact(LANES)).zip(surface.chunks_exact_mut(LANES)).enumerate() {
            let source = old.map(|o| &o[g * LANES * n..(g + 1) * LANES * n]);
            sweep.group::<LANES>(source, cols, inputs, surface, work.as_chunks_mut::<LANES>().0);
        }
        let done = count / LANES * LANES;
        let (inputs, surface) = (&inputs[done..], &mut surface[done..]);
        let narrow_len = inputs.len() / 4 * 4 * n;
        let (narrow, rest) = rest.split_at_mut(narrow_len);
        for (g, ((cols, inputs), surface)) in narrow.chunks_exact_mut(4 * n).zip(inputs.chunks_exact(4)).zip(surface.chunks_exact_mut(4)).enumerate() {
            let source = old.map(|o| &o[wide_len + g * 4 * n..wide_len + (g + 1) * 4 * n]);
            sweep.group::<4>(source, cols, inputs, surface, work.as_chunks_mut::<4>().0);
        }
        let done = inputs.len() / 4 * 4;
        for (k, ((col, input), surface_k)) in rest.chunks_exact_mut(n).zip(&inputs[done..]).zip(&mut surface[done..]).enumerate() {
            if let Some(o) = old {
                let start = wide_len + narrow_len + k * n;
                col.copy_from_slice(&o[start..start + n]);
            }
            *surface_k = sweep.one(col, input);
        }
        self.work = work;
    }

    /// The surface-only step (factors and storage coefficients already set): the forward elimination's last inner
    /// value d'_{N−2} = Σ_j γ_j u_j is linear in the old cell values with weights shared by every column,
    /// γ_j = (s_j/m_j) Π_{k=j+1}^{N−2} (−a_k/m_k) (s_j the storage coefficients, m_j the pivots, a_j the
    /// sub-diagonal), so each column takes one dot product over its contiguous old values (no division, no
    /// interleaving) and its surface row. The values agree with the full elimination to round-off (the sum in
    /// another order).
    #[allow(clippy::too_many_arguments)]
    fn outer_cells_only(&mut self, old: Option<&[f64]>, u: &mut [f64], g_scale: f64, mdot: f64, inputs: &[SurfaceInput], surface: &mut [f64]) {
        let n = self.len();
        let last = n - 1;
        // weights γ_j, j = 0..N−2, from the surface side inward
        let weights = &mut self.gamma[..last];
        let mut product = 1.0;
        for (j, g) in weights.iter_mut().enumerate().rev() {
            *g = self.storage[j] / self.d[j] * product;
            product *= -self.a[j] / self.d[j];
        }
        let sweep = self.sweep(g_scale, mdot, false);
        let gamma = &self.gamma[..last];
        let a_last = self.a[last];
        for (k, (input, surface_k)) in inputs.iter().zip(surface.iter_mut()).enumerate() {
            let column = match old {
                Some(o) => &o[k * n..(k + 1) * n],
                None => &u[k * n..(k + 1) * n],
            };
            let (inner, outer) = column.split_at(last);
            let prev = crate::numerics::linalg::dot(gamma, inner);
            let (alpha, beta, piv, rhs_last) = sweep.surface_row(input, outer[0]);
            let next = (rhs_last - a_last * prev) / piv;
            u[k * n + last] = next;
            *surface_k = alpha * next + beta;
        }
    }

    /// The sweep of a multi-column step over the factors and storage coefficients set for it.
    fn sweep(&self, g_scale: f64, mdot: f64, full: bool) -> Sweep<'_> {
        let n = self.len();
        Sweep {
            a: &self.a[..n],
            cp: &self.cp[..n],
            d: &self.d[..n],
            storage: &self.storage[..n],
            g_s: g_scale * self.factors[n],
            b_last: self.b[n - 1],
            mdot,
            full,
        }
    }

    /// Surface value for given cell values and surface input (same reconstruction as the step).
    pub fn surface_value(&self, u: &[f64], g_scale: f64, input: SurfaceInput) -> f64 {
        let n = self.len();
        if n == 1 {
            return u[0];
        }
        let g_s = g_scale * self.face_factor(n);
        let den = g_s - input.q1;
        (g_s * u[n - 1] + input.q0 - input.q1 * input.u_ref) / den
    }

    /// Mass-weighted mean of cell values.
    pub fn mean(&self, u: &[f64]) -> f64 {
        u.iter().zip(&self.widths).map(|(u, w)| u * w).sum()
    }
}

/// The factored shared rows of a multi-column implicit step and the data of its surface row.
struct Sweep<'a> {
    /// Sub-diagonal a_j.
    a: &'a [f64],
    /// Eliminated super-diagonal c_j/m_j of rows 0..n−2.
    cp: &'a [f64],
    /// Pivots m_j of rows 0..n−2.
    d: &'a [f64],
    /// Storage coefficients m_old Δη_j / Δt.
    storage: &'a [f64],
    /// Surface half-cell conductance G_s.
    g_s: f64,
    /// Diagonal of the surface row before its surface exchange.
    b_last: f64,
    /// Evaporation rate \[kg/s\].
    mdot: f64,
    /// With the back substitution (all cells), or the forward elimination only (outer cells and surface).
    full: bool,
}

impl Sweep<'_> {
    /// Surface reconstruction u_s = α u_N + β of `input` and the eliminated surface row: (α, β, diagonal,
    /// right-hand side without its sub-diagonal term) for the old outer-cell value `u_last`.
    #[inline(always)]
    fn surface_row(&self, input: &SurfaceInput, u_last: f64) -> (f64, f64, f64, f64) {
        let n = self.a.len();
        let den = self.g_s - input.q1;
        let alpha = self.g_s / den;
        let beta = (input.q0 - input.q1 * input.u_ref) / den;
        let diag_last = self.b_last + self.g_s * (1.0 - alpha) + self.mdot * alpha;
        let rhs_last = self.storage[n - 1] * u_last - (self.mdot - self.g_s) * beta;
        (alpha, beta, diag_last - self.a[n - 1] * self.cp[n - 2], rhs_last)
    }

    /// Solve one column in place; returns its new surface value.
    #[inline(always)]
    fn one(&self, col: &mut [f64], input: &SurfaceInput) -> f64 {
        let n = self.a.len();
        let (a, d, cp, storage) = (self.a, self.d, self.cp, self.storage);
        let (alpha, beta, piv, rhs_last) = self.surface_row(input, col[n - 1]);
        let (first, rest) = col.split_at_mut(1);
        first[0] = storage[0] * first[0] / d[0];
        let mut prev = first[0];
        let (inner, last) = rest.split_at_mut(n - 2);
        for (c, ((&aj, &sj), &dj)) in inner.iter_mut().zip(a[1..n - 1].iter().zip(&storage[1..n - 1]).zip(&d[1..n - 1])) {
            *c = (sj * *c - aj * prev) / dj;
            prev = *c;
        }
        last[0] = (rhs_last - a[n - 1] * prev) / piv;
        let u_last = last[0];
        if !self.full {
            return alpha * u_last + beta;
        }
        let mut next = u_last;
        for (c, &cpj) in col[..n - 1].iter_mut().zip(&cp[..n - 1]).rev() {
            *c -= cpj * next;
            next = *c;
        }
        alpha * u_last + beta
    }

    /// Solve `L` columns (`cols`, component-major, `L` × n values; old values from `source`, or `cols` itself)
    /// side by side in the interleaved scratch `work` (n rows of `L`), each with the operations of
    /// [`Sweep::one`]; new values to `cols`, new surface values to `surface`.
    #[inline(always)]
    fn group<const L: usize>(&self, source: Option<&[f64]>, cols: &mut [f64], inputs: &[SurfaceInput], surface: &mut [f64], work: &mut [[f64; L]]) {
        let n = self.a.len();
        let (a, d, cp, storage) = (self.a, self.d, self.cp, self.storage);
        let work = &mut work[..n];
        for (l, col) in source.unwrap_or(cols).chunks_exact(n).enumerate().take(L) {
            for (row, &v) in work.iter_mut().zip(col) {
                row[l] = v;
            }
        }
        // (a plain loop: `std::array::from_fn` left a closure call per column)
        let mut rows = [(0.0, 0.0, 0.0, 0.0); L];
        for (l, row) in rows.iter_mut().enumerate() {
            *row = self.surface_row(&inputs[l], work[n - 1][l]);
        }
        let mut prev = work[0];
        for v in prev.iter_mut() {
            *v = storage[0] * *v / d[0];
        }
        work[0] = prev;
        for (row, ((&aj, &sj), &dj)) in work[1..n - 1].iter_mut().zip(a[1..n - 1].iter().zip(&storage[1..n - 1]).zip(&d[1..n - 1])) {
            for (x, p) in row.iter_mut().zip(&prev) {
                *x = (sj * *x - aj * p) / dj;
            }
            prev = *row;
        }
        let a_last = a[n - 1];
        let mut next = [0.0; L];
        for (l, v) in next.iter_mut().enumerate() {
            *v = (rows[l].3 - a_last * prev[l]) / rows[l].2;
            surface[l] = rows[l].0 * *v + rows[l].1;
        }
        work[n - 1] = next;
        if !self.full {
            for (l, col) in cols.chunks_exact_mut(n).enumerate().take(L) {
                col[n - 1] = next[l];
            }
            return;
        }
        for (row, &cpj) in work[..n - 1].iter_mut().zip(&cp[..n - 1]).rev() {
            for (x, nx) in row.iter_mut().zip(&next) {
                *x -= cpj * nx;
            }
            next = *row;
        }
        for (l, col) in cols.chunks_exact_mut(n).enumerate().take(L) {
            for (c, row) in col.iter_mut().zip(work.iter()) {
                *c = row[l];
            }
        }
    }
}

/// Roots β_n of β cot β + L − 1 = 0 (Crank, The Mathematics of Diffusion, 2nd ed., eq. 6.41).
pub fn crank_roots(l: f64, count: usize) -> Vec<f64> {
    let f = |b: f64| b * b.cos() / b.sin() + l - 1.0;
    let mut roots = Vec::with_capacity(count);
    for n in 0..count {
        let (lo, hi) = (n as f64 * std::f64::consts::PI + 1e-12, (n as f64 + 1.0) * std::f64::consts::PI - 1e-12);
        // f decreases from +∞ to −∞ on each branch: one root per branch, to full precision
        let root = brent(f, lo, hi, Tolerance::absolute(0.0)).map(|r| r.x);
        roots.push(root.unwrap_or_else(|e| e.best().unwrap_or(0.5 * (lo + hi))));
    }
    roots
}

/// Fraction of the final uptake/loss reached at time t by a sphere of radius a with a surface-transfer
/// (Robin) condition, M_t/M_∞ = 1 − Σ 6L² exp(−β_n² κ t/a²)/(β_n²(β_n² + L(L−1))) (Crank eq. 6.40;
/// Carslaw & Jaeger §9.4 for heat), L = a h/κ-type Biot number.
pub fn crank_robin_fraction(l: f64, kappa_t_over_a2: f64, terms: usize) -> f64 {
    let roots = crank_roots(l, terms);
    1.0 - roots.iter().map(|b| 6.0 * l * l * (-b * b * kappa_t_over_a2).exp() / (b * b * (b * b + l * (l - 1.0)))).sum::<f64>()
}

/// Same for a surface held at the final value (Crank eq. 6.20): 1 − (6/π²) Σ exp(−n²π² κ t/a²)/n².
pub fn crank_dirichlet_fraction(kappa_t_over_a2: f64, terms: usize) -> f64 {
    let pi2 = std::f64::consts::PI * std::f64::consts::PI;
    1.0 - 6.0 / pi2 * (1..=terms).map(|n| { let n2 = (n * n) as f64; (-n2 * pi2 * kappa_t_over_a2).exp() / n2 }).sum::<f64>()
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Fixed radius, no evaporation: diffusion out of a sphere into a surface held at zero (Dirichlet through a
    /// very large transfer coefficient) against Crank's series, eq. 6.20.
    #[test]
    fn shared_factorisation_matches_single_solves() {
        let mut g = RadialGrid::new(12);
        let base: Vec<f64> = (0..36).map(|k| 0.2 + 0.01 * (k as f64).sin()).collect();
        let inputs = [
            SurfaceInput { q0: -1e-9, q1: 2e-9, u_ref: 0.0 },
            SurfaceInput { q0: 0.0, q1: -5e-9, u_ref: 0.0 },
            SurfaceInput { q0: 3e-10, q1: 1e-9, u_ref: 0.1 },
        ];
        let mut many = base.clone();
        let mut surf = [0.0; 3];
        g.implicit_step_many(&mut many, 1e-10, 0.99e-10, 1e-4, 4e-8, 1e-8, &inputs, &mut surf);
        for k in 0..3 {
            let mut one = base[k * 12..(k + 1) * 12].to_vec();
            let s = g.implicit_step(&mut one, 1e-10, 0.99e-10, 1e-4, 4e-8, 1e-8, inputs[k]);
            assert!((s - surf[k]).abs() < 1e-12 * s.abs().max(1.0));
            for j in 0..12 {
                assert!((one[j] - many[k * 12 + j]).abs() < 1e-12, "{k} {j}");
            }
        }
    }

    /// Thirteen columns (a group of eight, one of four and a single column): the interleaved sweeps give the bits
    /// of one column solved alone, the step from separate old values gives the bits of the step in place, and the
    /// surface-only step gives the same surface values and outer cells to round-off (1e-14 relative).
    #[test]
    fn interleaved_columns_match_single_solves_bit_for_bit() {
        let cells = 9;
        let species = 13;
        let mut g = RadialGrid::new(cells);
        let base: Vec<f64> = (0..species * cells).map(|k| 0.05 + 0.01 * ((k as f64) * 0.37).sin().abs()).collect();
        let inputs: Vec<SurfaceInput> = (0..species).map(|k| SurfaceInput { q0: -1e-10 * k as f64, q1: 2e-9 - 4e-10 * k as f64, u_ref: 0.0 }).collect();
        let (m_old, m_new, dt, g_scale, mdot) = (1e-10, 0.98e-10, 1e-4, 4e-8, 2e-8);
        let mut many = base.clone();
        let mut surf = vec![0.0; species];
        g.implicit_step_many(&mut many, m_old, m_new, dt, g_scale, mdot, &inputs, &mut surf);
        for k in 0..species {
            let mut one = base[k * cells..(k + 1) * cells].to_vec();
            let mut s1 = [0.0];
            g.implicit_step_many(&mut one, m_old, m_new, dt, g_scale, mdot, &inputs[k..k + 1], &mut s1);
            assert_eq!(s1[0].to_bits(), surf[k].to_bits(), "surface {k}");
            for j in 0..cells {
                assert_eq!(one[j].to_bits(), many[k * cells + j].to_bits(), "{k} {j}");
            }
        }
        let mut from = vec![7.0; species * cells];
        let mut surf_from = vec![0.0; species];
        g.implicit_step_many_from(&base, &mut from, m_old, m_new, dt, g_scale, mdot, &inputs, &mut surf_from);
        assert!(from.iter().zip(&many).all(|(a, b)| a.to_bits() == b.to_bits()));
        assert!(surf_from.iter().zip(&surf).all(|(a, b)| a.to_bits() == b.to_bits()));
        let mut outer = vec![7.0; species * cells];
        let mut surf_outer = vec![0.0; species];
        g.implicit_surface_many_from(&base, &mut outer, m_old, m_new, dt, g_scale, mdot, &inputs, &mut surf_outer);
        // (the surface-only step sums the forward elimination in another order: round-off)
        for k in 0..species {
            assert!((surf_outer[k] - surf[k]).abs() <= 1e-14 * surf[k].abs(), "surface {k}: {} vs {}", surf_outer[k], surf[k]);
            let (a, b) = (outer[k * cells + cells - 1], many[k * cells + cells - 1]);
            assert!((a - b).abs() <= 1e-14 * b.abs(), "outer cell {k}: {a} vs {b}");
        }
    }

    #[test]
    fn dirichlet_sphere_against_crank() {
        let (rho, kappa, a): (f64, f64, f64) = (700.0, 1e-9, 50e-6);
        let m = rho * 4.0 / 3.0 * std::f64::consts::PI * a.powi(3);
        let area = 4.0 * std::f64::consts::PI * a * a;
        let g_scale = rho * rho * kappa * area * area / m;
        let mut grid = RadialGrid::new(80);
        let mut u = vec![1.0; 80];
        let h = 1e6 * g_scale; // transfer coefficient ≫ internal conductance
        let t_end = 0.1 * a * a / kappa;
        let steps = 4000;
        let dt = t_end / steps as f64;
        for _ in 0..steps {
            let us = grid.surface_value(&u, g_scale, SurfaceInput { q0: 0.0, q1: -h, u_ref: 0.0 });
            let _ = us;
            grid.implicit_step(&mut u, m, m, dt, g_scale, 0.0, SurfaceInput { q0: 0.0, q1: -h, u_ref: 0.0 });
        }
        let lost = 1.0 - grid.mean(&u);
        let exact = crank_dirichlet_fraction(0.1, 200);
        assert!((lost / exact - 1.0).abs() < 5e-3, "{lost} vs {exact}");
    }
}
