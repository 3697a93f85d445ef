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
}
