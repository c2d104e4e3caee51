/* derive.h: the derived quantities, their flags, the parameters of a
 * derivation run, and the interface every derivation module implements.
 *
 * A module is one file in src/core/derive/ with one SlModule; the engine
 * (engine.c) orders the modules by what they need and give, runs them per
 * star, and propagates uncertainties linearly (SlDual) or by Monte Carlo.
 */
#pragma once

#include <gsl/gsl_rng.h>

#include "../combine.h"
#include "../dual.h"
#include "../vocabulary.h"

G_BEGIN_DECLS

/* The derived quantities (DESIGN.md, "Vocabulary"), in table order. */
typedef enum {
  SL_Q_PLX_SNR,
  SL_Q_DIST,
  SL_Q_DISTMOD,
  SL_Q_AV,
  SL_Q_BV0,
  SL_Q_ABSMAG,
  SL_Q_TEFF,
  SL_Q_BC,
  SL_Q_MBOL,
  SL_Q_LUM,
  SL_Q_RADIUS,
  SL_Q_VTAN,
  SL_Q_ELON,
  SL_Q_ELAT,
  SL_Q_ELLIPSE_A,
  SL_Q_ELLIPSE_B,
  SL_Q_ELLIPSE_PA,
  SL_Q_SPCLASS,
  SL_N_QUANTITIES
} SlQuantity;

#define SL_Q_NONE SL_N_QUANTITIES

typedef struct {
  const char *name;         /* vocabulary name: column in files and database */
  const char *unit;         /* "" for dimensionless and text */
  gboolean    is_text;
  const char *description;  /* marked N_() */
} SlQuantityInfo;

const SlQuantityInfo *sl_quantity_info (SlQuantity q);
gboolean sl_quantity_from_name (const char *name, SlQuantity *q);

/* Flags travel with a star's values; each says something a reader of
 * the numbers must know.  Stored as a bit mask. */
typedef enum {
  SL_FLAG_NO_PARALLAX_ERROR   = 1u << 0,  /* parallax without error: no S/N, no intervals */
  SL_FLAG_NONPOSITIVE_PARALLAX = 1u << 1, /* parallax <= 0 (after the zero-point offset) */
  SL_FLAG_LOW_PARALLAX_SNR    = 1u << 2,  /* parallax S/N below 5 */
  SL_FLAG_PRIOR_DOMINATED     = 1u << 3,  /* EDSD distance: sigma/parallax above 0.5 */
  SL_FLAG_MONTE_CARLO_AUTO    = 1u << 4,  /* Monte Carlo used because first order fails here */
  SL_FLAG_EXTINCTION_ASSUMED_ZERO = 1u << 5, /* no E(B-V): A_V = 0 assumed */
  SL_FLAG_COLOUR_OUT_OF_RANGE = 1u << 6,  /* (B-V)0 outside the Teff calibration */
  SL_FLAG_TEFF_OUT_OF_RANGE   = 1u << 7,  /* Teff outside the BC or class calibration */
  SL_FLAG_MISSING_ERROR       = 1u << 8,  /* an input has no error: some values have no interval */
  SL_FLAG_OVERRIDDEN          = 1u << 9,  /* a value was set by hand; values below it follow it */
  SL_FLAG_SPTYPE_NOT_DWARF    = 1u << 10, /* catalogued type is not class V: the class estimate is on the dwarf scale */
  SL_FLAG_SOURCES_DISAGREE    = 1u << 11, /* sources' values of an input differ beyond their errors (inputs.c) */
} SlFlag;

#define SL_N_FLAGS 12

typedef struct {
  SlFlag      flag;
  const char *name;         /* in the flags column: lower case, underscores */
  const char *explanation;  /* one sentence for tooltips and explain; marked N_() */
} SlFlagInfo;

const SlFlagInfo *sl_flag_info (guint index);
/* "a|b|c" for a mask; a new string. */
char *sl_flags_to_string (guint32 flags);

typedef enum {
  SL_DISTANCE_INVERSE,
  SL_DISTANCE_EDSD,
} SlDistanceMethod;

typedef enum {
  SL_TEFF_FLOWER_TORRES,
  SL_TEFF_BALLESTEROS,
} SlTeffMethod;

typedef enum {
  SL_ERRORS_LINEAR,
  SL_ERRORS_MONTE_CARLO,
} SlErrorMethod;

/* Everything a run's results depend on besides the raw rows; recorded
 * with each run (as JSON) so that verify can recompute. */
typedef struct {
  SlDistanceMethod distance;
  double           length_scale_pc;      /* EDSD prior length scale L */
  double           parallax_zero_point;  /* mas, subtracted from every parallax */
  double           rv;                   /* extinction ratio R_V = A_V / E(B-V) */
  double           rv_err;               /* its 1-sigma error, 0 for none */
  SlTeffMethod     teff;
  SlErrorMethod    errors;
  guint            draws;                /* Monte Carlo draws per star */
  guint64          seed;
  double           mc_below_snr;         /* linear runs use Monte Carlo below this parallax S/N */
  SlCombinePolicy  combine;              /* how several sources' rows become one input: the
                                          * project's policy when the run began (inputs.h) */
} SlDeriveParams;

void     sl_derive_params_init (SlDeriveParams *params);
/* As recorded with a run: GLib key-file text. */
char    *sl_derive_params_to_keyfile (const SlDeriveParams *params);
gboolean sl_derive_params_from_keyfile (SlDeriveParams *params, const char *text, GError **error);
/* As JSON, for explain --json. */
char    *sl_derive_params_to_json (const SlDeriveParams *params);
/* One line for people: "distance inverse, errors linear, R_V 3.1, ...". */
char    *sl_derive_params_describe (const SlDeriveParams *params);

/* The parameters one by one, as people choose them: what the window's
 * derive dialog offers, the ranges the CLI and the dialog accept, and the
 * published method each choice selects (its citation), in one table
 * (registry.c) so that every front end shows the same text. */
typedef enum {
  SL_PARAM_DISTANCE,
  SL_PARAM_LENGTH_SCALE,
  SL_PARAM_PARALLAX_ZERO_POINT,
  SL_PARAM_RV,
  SL_PARAM_RV_ERR,
  SL_PARAM_TEFF,
  SL_PARAM_ERRORS,
  SL_PARAM_DRAWS,
  SL_PARAM_SEED,
  SL_PARAM_MC_BELOW_SNR,
  SL_N_PARAMS
} SlParam;

typedef enum {
  SL_PARAM_KIND_CHOICE,   /* one of choices[] (an enum of SlDeriveParams) */
  SL_PARAM_KIND_NUMBER,   /* a double in [min, max] */
  SL_PARAM_KIND_COUNT,    /* a whole number in [count_min, count_max] */
} SlParamKind;

typedef struct {
  const char *name;       /* as recorded and on the command line: "edsd" */
  const char *label;      /* for people; marked N_() */
  const char *summary;    /* what it does, one sentence; marked N_() */
  const char *citation;   /* the published method it selects; "" for none */
} SlParamChoice;

#define SL_PARAM_MAX_CHOICES 2

typedef struct {
  const char   *name;       /* the key in the recorded parameters */
  SlParamKind   kind;
  const char   *label;      /* for people; marked N_() */
  const char   *unit;       /* "pc", "mas", "" */
  const char   *help;       /* one sentence; marked N_() */
  const char   *citation;   /* source of the method or of the default; "" for none */
  double        min, max;   /* NUMBER: accepted range, both inclusive */
  guint64       count_min, count_max;  /* COUNT: accepted range, both inclusive */
  guint         n_choices;  /* CHOICE: the choices, in enum order */
  SlParamChoice choices[SL_PARAM_MAX_CHOICES];
} SlParamInfo;

const SlParamInfo *sl_param_info (SlParam param);
/* Looks a parameter up by its recorded name; FALSE if there is none. */
gboolean sl_param_from_name (const char *name, SlParam *param);
/* PARAM of PARAMS as text: a choice's name, a number as sl_format_double
 * writes it, a count in decimal.  A new string. */
char    *sl_param_to_text (const SlDeriveParams *params, SlParam param);
/* Sets PARAM of PARAMS from TEXT (a choice's name, a number parsed as
 * sl_parse_number does, a count); FALSE with an SL_ERROR_BAD_INPUT error
 * naming the parameter and its accepted range if TEXT is none of those,
 * and PARAMS unchanged. */
gboolean sl_param_from_text (SlDeriveParams *params, SlParam param, const char *text, GError **error);
/* The index of the choice PARAMS makes for a CHOICE parameter, and
 * setting it. */
guint    sl_param_get_choice (const SlDeriveParams *params, SlParam param);
void     sl_param_set_choice (SlDeriveParams *params, SlParam param, guint choice);
/* The citation of what PARAMS selects through PARAM: the chosen method's
 * for a choice, the parameter's own otherwise ("" for none; static). */
const char *sl_param_citation (const SlDeriveParams *params, SlParam param);
/* Whether every parameter lies in its range; the first that does not is
 * named in an SL_ERROR_BAD_INPUT error. */
gboolean sl_derive_params_check (const SlDeriveParams *params, GError **error);

/* The state of one evaluation of the chain for one star: the linear pass,
 * or one Monte Carlo draw. */
typedef struct {
  const SlDeriveParams *params;

  gboolean    has_in[SL_N_FIELDS];
  SlDual      in[SL_N_FIELDS];        /* inputs: measured (linear) or drawn (MC) */
  double      measured[SL_N_FIELDS];  /* the measured values (parallax less the zero point) */
  double      sigma[SL_N_FIELDS];     /* 1-sigma errors, NAN if none */
  const char *sptype;

  gboolean    has[SL_N_QUANTITIES];
  SlDual      q[SL_N_QUANTITIES];
  const char *text[SL_N_QUANTITIES];  /* text quantities, in text_buffer */
  char        text_buffer[32];
  gboolean    overridden[SL_N_QUANTITIES];

  /* A quantity whose interval is not value -/+ sigma (a posterior's
   * highest-density interval) sets it here in the linear pass. */
  gboolean    has_interval[SL_N_QUANTITIES];
  double      interval_lo[SL_N_QUANTITIES];
  double      interval_hi[SL_N_QUANTITIES];

  guint32     flags;
  gsl_rng    *rng;                    /* set in Monte Carlo draws */
  gpointer    cache;                  /* a module's per-star cache (the EDSD posterior) */
  GDestroyNotify cache_free;
} SlEval;

static inline void
sl_eval_set (SlEval *ev, SlQuantity q, SlDual value)
{
  if (ev->overridden[q])
    return;   /* a value set by hand wins; the engine put it in place */
  ev->has[q] = TRUE;
  /* Only the partials in use: a draw's value is one double, not a
   * struct of them. */
  ev->q[q].v = value.v;
  ev->q[q].n = value.n;
  for (int k = 0; k < value.n; k++)
    ev->q[q].d[k] = value.d[k];
}

#define SL_MODULE_MAX_IO 6

typedef struct {
  const char *name;          /* e.g. "distance" */
  int         version;       /* bump when the numbers it gives change */
  const char *method;        /* e.g. "EDSD prior posterior mode" */
  const char *citation;      /* e.g. "Bailer-Jones 2015, PASP 127, 994" */
  const char *formula;       /* the step in words, for explain; marked N_() */
  const char *validity;      /* validity range in words */
  SlField     inputs[SL_MODULE_MAX_IO];  /* raw inputs, SL_FIELD_NONE-terminated */
  SlQuantity  needs[SL_MODULE_MAX_IO];   /* derived inputs, SL_Q_NONE-terminated */
  SlQuantity  gives[SL_MODULE_MAX_IO];   /* outputs, SL_Q_NONE-terminated */
  const char *parameters;    /* names of the parameters it reads, for explain */
  void      (*compute) (SlEval *ev);
  /* Takes random numbers of its own from ev->rng in a Monte Carlo draw.
   * A module that does not, and none of whose inputs and needs vary
   * between draws, runs once per star instead of once per draw. */
  gboolean    draws;
} SlModule;

/* The registry (registry.c): every module, in an order the engine checks
 * and sorts by needs and gives. */
const SlModule *const *sl_modules (guint *n_modules);

G_END_DECLS
