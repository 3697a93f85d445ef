//! Unit tests of the gas film (src/model/film.rs).
mod formulas {
    use super::super::*;

    /// Check values computed from the published formulas (../shared physics notes A.10).
    #[test]
    fn published_formula_values() {
        for (b, f) in [(0.1, 1.01886), (0.5, 1.07708), (1.0, 1.12602), (2.0, 1.18522), (5.0, 1.25608), (10.0, 1.28471)] {
            assert!((film_correction(b) - f).abs() < 1e-5 * f, "F({b})");
        }
        assert!((film_correction(0.0) - 1.0).abs() < 1e-12);
        let c = TransferCorrelation::Clift;
        for (re, pr, nu) in [(0.0, 0.7, 2.0), (1.0, 0.7, 2.19348), (10.0, 0.7, 3.38798), (100.0, 0.7, 6.90318), (100.0, 2.0, 9.35088)] {
            assert!((c.nusselt0(re, pr) - nu).abs() < 1e-4 * nu, "Nu0({re},{pr})");
        }
        let nu_star = 2.0 + (c.nusselt0(100.0, 0.7) - 2.0) / film_correction(1.0);
        assert!((nu_star - 6.35443).abs() < 1e-4 * 6.35443);
        for (pe, chi) in [(10.0, 1.18380), (30.0, 1.86), (100.0, 2.56705), (500.0, 2.71255)] {
            assert!((circulation_factor(pe) - chi).abs() < 1e-4, "chi({pe})");
        }
    }

}

mod boiling {
    use super::super::*;

    fn film(extra_heat: ExtraHeat, t_inf: f64) -> Film {
        let lib = crate::data::Library::embedded().unwrap();
        let c = lib.component("n-decane").unwrap().clone();
        Film::new(FilmSetup {
            components: vec![c],
            gas: crate::props::gas::AmbientGas::air(&lib).unwrap(),
            pressure: 101_325.0,
            ambient_temperature: t_inf,
            ambient_vapor: vec![0.0],
            reference_weight: 1.0 / 3.0,
            correlation: TransferCorrelation::Clift,
            non_equilibrium: false,
            extra_heat,
            drag: DragLaw::YuenChen,
            activity: Activity::ideal(1),
            vapour_diffusion: VapourDiffusion::Mixture,
        })
    }

    /// Heat-limited boiling closes the surface energy balance ṁ L = Q_gas + Q_extra: without extra heat at the
    /// classical B_T = c_pF ΔT/L (hot gas), with radiation in cold gas (Q_gas < 0, B_T far beyond 1e10), and
    /// with no rate at all when the net heat is negative.
    #[test]
    fn boiling_rate_follows_the_net_heat() {
        let (t_s, d, l) = (447.0, 50e-6, 2.6e5);
        let latent = [l];
        let mut f = film(ExtraHeat::default(), 1500.0);
        let r = f.evaluate(&[1.0], t_s, d, 3.0, &latent, Some(l));
        assert!(r.evaporation_rate > 0.0);
        assert!((r.evaporation_rate * l / r.heat_from_gas - 1.0).abs() < 1e-9, "{r:?}");
        let rad = ExtraHeat { radiation: Some(Radiation { temperature: Some(4000.0), absorption_efficiency: 1.0 }), fibre: None };
        let mut f = film(rad, 300.0);
        let r = f.evaluate(&[1.0], t_s, d, 0.0, &latent, Some(l));
        assert!(r.heat_from_gas < 0.0 && r.heat_extra > 0.0 && r.spalding_heat > 1e10, "{r:?}");
        assert!((r.evaporation_rate * l / (r.heat_from_gas + r.heat_extra) - 1.0).abs() < 1e-9, "{r:?}");
        assert!(r.heat_to_liquid.abs() < 1e-9 * r.heat_extra, "pure liquid: all net heat evaporates it");
        let mut f = film(ExtraHeat::default(), 300.0);
        let r = f.evaluate(&[1.0], t_s, d, 0.0, &latent, Some(l));
        assert_eq!(r.evaporation_rate, 0.0);
        assert!(r.heat_to_liquid < 0.0, "the liquid loses heat: the droplet model leaves the regime");
    }

    /// The B_T Newton iteration at a run's tolerance: along a droplet-like sequence of close states (n-decane,
    /// surface 300 → 440 K, diameter 50 → 10 µm, 5 m/s in air at 800 K; B_T from 0.008 to 190), the film
    /// evaluated with the default rtol's tolerance (1e-5) gives the rates, heat fluxes, B_T and Nu* of the 1e-7
    /// tolerance within 2e-9 relative (the net heat into the liquid relative to the gas heat), and a run at
    /// rtol 1e-11 keeps 1e-7.
    #[test]
    fn heat_iteration_tolerance_leaves_errors_far_below_the_run_tolerance() {
        assert_eq!(heat_iteration_tolerance(1e-11), 1e-7);
        assert!((heat_iteration_tolerance(1e-6) / 1e-5 - 1.0).abs() < 1e-12);
        let (mut tight, mut loose) = (film(ExtraHeat::default(), 800.0), film(ExtraHeat::default(), 800.0));
        tight.heat_iteration_tolerance = 1e-7;
        loose.heat_iteration_tolerance = heat_iteration_tolerance(1e-6);
        let latent = [3.0e5];
        let mut worst = 0.0f64;
        for k in 0..=1400 {
            let t_s = 300.0 + 0.1 * k as f64;
            let d = 50e-6 - 40e-6 * k as f64 / 1400.0;
            let a = tight.evaluate(&[1.0], t_s, d, 5.0, &latent, None);
            let b = loose.evaluate(&[1.0], t_s, d, 5.0, &latent, None);
            // the net heat into the liquid relative to the gas heat it is a difference of
            let net = (b.heat_to_liquid - a.heat_to_liquid) / a.heat_from_gas;
            for dev in [b.evaporation_rate / a.evaporation_rate - 1.0, net, b.heat_from_gas / a.heat_from_gas - 1.0, b.spalding_heat / a.spalding_heat - 1.0, b.nusselt / a.nusselt - 1.0] {
                worst = worst.max(dev.abs());
            }
        }
        eprintln!("B_T iteration at rtol 1e-6 against 1e-7: largest relative difference {worst:e}");
        assert!(worst < 2e-9, "largest relative difference {worst:e}");
    }
}

mod liquid_state {
    use super::super::*;

    /// The surface part of the liquid state (latent heats, kept vapour pressures) has the bits of the full one,
    /// through kernels and directly, inside and outside the kernels' range (1000 K: the direct correlations).
    #[test]
    fn surface_liquid_state_has_the_bits_of_the_full_one() {
        let lib = crate::data::Library::embedded().unwrap();
        let ids = ["n-heptane", "n-dodecane", "toluene", "n-hexadecane"];
        let direct: Vec<std::sync::Arc<crate::data::Component>> = ids.iter().map(|id| lib.component(id).unwrap().clone()).collect();
        for mode in [crate::props::kernels::PropertyEvaluation::Kernels, crate::props::kernels::PropertyEvaluation::Direct] {
            let comps = crate::props::kernels::run_components(&direct, mode);
            let setup = FilmSetup {
                components: comps,
                gas: crate::props::gas::AmbientGas::air(&lib).unwrap(),
                pressure: 101_325.0,
                ambient_temperature: 800.0,
                ambient_vapor: vec![0.0; 4],
                reference_weight: 1.0 / 3.0,
                correlation: TransferCorrelation::Clift,
                non_equilibrium: false,
                extra_heat: ExtraHeat::default(),
                drag: DragLaw::YuenChen,
                activity: Activity::ideal(4),
                vapour_diffusion: VapourDiffusion::Mixture,
            };
            let (mut full, mut part) = (Film::new(setup.clone()), Film::new(setup));
            let w = [0.4, 0.3, 0.2, 0.1];
            for t in [250.0, 300.0, 347.3, 420.0, 505.5, 1000.0] {
                let (mut l_full, mut l_part) = ([0.0; 4], [0.0; 4]);
                let _ = full.liquid_state(&w, t, &mut l_full);
                part.surface_liquid_state(t, &mut l_part);
                for (a, b) in l_full.iter().zip(&l_part) {
                    assert_eq!(a.to_bits(), b.to_bits(), "{mode:?} {t}");
                }
                for (a, b) in full.vapor_pressures.iter().zip(&part.vapor_pressures) {
                    assert_eq!(a.to_bits(), b.to_bits(), "{mode:?} {t}");
                }
                assert_eq!(part.vapor_pressure_temperature, Some(t));
            }
        }
    }
}
