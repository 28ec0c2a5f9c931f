/*
 * design_args.c - the shared design options (see design_args.h).
 */
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "design_args.h"
#include "deltak/units.h"

int
cli_design_option(int ch, cli_design_args *a)
{
    switch (ch) {
    case 'p': a->waves.pump = optarg; return 1;
    case 's': a->waves.signal = optarg; return 1;
    case 'i': a->waves.idler = optarg; return 1;
    case 'f': a->waves.fundamental = optarg; return 1;
    case 't': a->temp = optarg; return 1;
    case 'P': a->period = optarg; return 1;
    case 'o': a->pol = optarg; return 1;
    case 'T': a->type = optarg; return 1;
    case 'Q': a->theta = optarg; return 1;
    case 'm': a->order = optarg; return 1;
    }
    return 0;
}

int
cli_design_parse(const cli_design_args *a, cli_design_spec *sp,
                 int need_waves, const char *const usage[])
{
    dk_error err = {0};
    memset(sp, 0, sizeof *sp);
    sp->temp_c = 25;
    sp->theta_rad = NAN;
    sp->pol = a->pol;
    sp->type = a->type;
    const cli_wave_args *w = &a->waves;
    int given = !!w->pump + !!w->signal + !!w->idler;
    if (cli_parse_waves(w, need_waves, &sp->waves, &sp->shg, usage))
        return CLI_USAGE;
    if (!need_waves && !sp->shg && given > 2)
        return cli_usage_error(usage, "give at most two of --pump, --signal "
                                      "and --idler");
    if (!need_waves && !sp->shg && given == 2 &&
        dk_waves_complete(&sp->waves, &err))
        return cli_usage_error(usage, "%s", err.msg);
    sp->held = w->signal ? 1 : w->idler ? 2 : 0;
    if ((a->temp && dk_parse_temperature(a->temp, &sp->temp_c, &err)) ||
        (a->period && dk_parse_length(a->period, &sp->period_um, &err)))
        return cli_usage_error(usage, "%s", err.msg);
    sp->have_temp = a->temp != NULL;
    sp->period_um *= 1e3;   /* mm → µm */
    char *end;
    if (a->theta &&
        (sp->theta_rad = strtod(a->theta, &end) * M_PI / 180, *end))
        return cli_usage_error(usage, "--theta '%s' must be degrees, e.g. "
                                      "22.8",
                               a->theta);
    sp->order = 1;
    if (a->order &&
        ((sp->order = (int)strtol(a->order, &end, 10)) < 1 || *end))
        return cli_usage_error(usage, "--order '%s' must be a positive whole "
                                      "number",
                               a->order);
    if (a->type && strcmp(a->type, "I") && strcmp(a->type, "II"))
        return cli_usage_error(usage, "--type '%s' must be I or II", a->type);
    return 0;
}

int
cli_design_setup(const cli_design_spec *sp, const dk_crystal *c,
                 const dk_dispersion_set *set, dk_design *d, int *qpm)
{
    dk_error err = {0};
    d->waves = sp->waves;
    d->shg = sp->shg;
    d->temp_c = sp->temp_c;
    /* Without --temp a set with no T dependence is used at its own
     * reference temperature. */
    if (!sp->have_temp && !dk_set_has_temperature(set))
        d->temp_c = set->reference_temperature_c;
    *qpm = sp->period_um > 0 || (c->poling != DK_POLING_NONE && !sp->type &&
                                 !isfinite(sp->theta_rad));
    dk_status s = *qpm ? dk_design_setup_qpm(d, c, set, sp->pol, sp->order,
                                             sp->period_um, sp->have_temp,
                                             &err)
                       : dk_design_setup_angle(d, c, set, sp->pol, sp->type,
                                               sp->theta_rad, &err);
    return s ? cli_error("%s", err.msg) : 0;
}
