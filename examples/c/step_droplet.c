/* Advance one droplet of the demo-narrow fuel through a changing far field with the dropcut C interface and
 * print its exchange terms each step (SI units). Build: see tests/capi/run.sh. The same scenario through the
 * Rust API is examples/step_droplet.rs; both print the same lines. */
#include <stdio.h>
#include <math.h>
#include <stdlib.h>
#include "dropcut.h"

static int check(int code, const char *what) {
    if (code != DC_OK) {
        fprintf(stderr, "%s failed (code %d): %s\n", what, code, dc_last_error());
        exit(1);
    }
    return code;
}

int main(void) {
    DcStepper *stepper = NULL;
    check(dc_stepper_new("demo-narrow", "air", 40e-6, 300.0, DC_LIQUID_WELL_MIXED, 1, &stepper), "dc_stepper_new");
    size_t n = 0;
    check(dc_stepper_components(stepper, &n), "dc_stepper_components");
    double *vapor = calloc(n, sizeof(double));
    double *mass = calloc(n, sizeof(double));
    DcFarField far = {600.0, 2.0e5, vapor, n, {1.0, 0.0, 0.0}};
    const double velocity[3] = {11.0, 0.0, 0.0};
    DcDroplet *droplet = NULL;
    check(dc_droplet_new(stepper, &far, velocity, &droplet), "dc_droplet_new");
    const double dt = 5e-5;
    for (int step = 0; step < 2000; step++) {
        /* the gas heats up and slows down along the droplet's path; some of the lightest vapour is present */
        far.temperature = 600.0 + 2.0 * step < 1100.0 ? 600.0 + 2.0 * step : 1100.0;
        far.gas_velocity[0] = 1.0 + 0.01 * step;
        vapor[0] = step < 50 ? 0.0 : 1e-4;
        double energy = 0.0, momentum[3] = {0.0, 0.0, 0.0};
        int finished = 0;
        check(dc_advance(stepper, droplet, dt, &far, mass, n, &energy, momentum, &finished), "dc_advance");
        double t, m, ts, d, v[3];
        check(dc_droplet_get(stepper, droplet, &t, &m, &ts, &d, v), "dc_droplet_get");
        printf("step %d t %.17e m %.17e Ts %.17e d %.17e energy %.17e momentum %.17e %.17e %.17e mass", step, t, m, ts, d, energy, momentum[0], momentum[1], momentum[2]);
        for (size_t i = 0; i < n; i++) printf(" %.17e", mass[i]);
        printf("\n");
        if (finished) break;
    }
    /* refused calls: a null handle, a NaN far field and a negative step give a code and a message */
    double energy = 0.0, momentum[3];
    int finished = 0;
    int code = dc_advance(NULL, droplet, dt, &far, mass, n, &energy, momentum, &finished);
    printf("null handle: code %d: %s\n", code, dc_last_error());
    far.temperature = NAN;
    code = dc_advance(stepper, droplet, dt, &far, mass, n, &energy, momentum, &finished);
    printf("NaN far field: code %d: %s\n", code, dc_last_error());
    far.temperature = 900.0;
    code = dc_advance(stepper, droplet, -dt, &far, mass, n, &energy, momentum, &finished);
    printf("negative step: code %d: %s\n", code, dc_last_error());
    dc_droplet_free(droplet);
    dc_stepper_free(stepper);
    free(vapor);
    free(mass);
    return 0;
}
