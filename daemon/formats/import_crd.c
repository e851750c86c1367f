/* SPDX-License-Identifier: BSD-3-Clause */
/* import_crd.c: CRD normal-point files (H1..H9 and record 11). */
#include <ctype.h>
#include <errno.h>
#include <limits.h>
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include <erfa.h>
#include <erfam.h>

#include "core/geom.h"
#include "core/mem.h"
#include "core/text.h"
#include "core/tscale.h"
#include "formats/import.h"
#include "formats/import_util.h"

#define LINE_MAX_CRD 512	/* a CRD record line, bytes */

/* ------------------------------------------------------------------ */
/* CRD normal points                                                   */
/* ------------------------------------------------------------------ */

#define CRD_MAX_TOKENS 40
#define CRD_SLACK_S 60.0	/* tolerance on the H4 start and end times */
#define CRD_TOF_MIN 2.0		/* a lunar two-way time of flight, s */
#define CRD_TOF_MAX 3.0

struct crd_state {
	int version;			/* from H1, 0 before it */
	size_t h1_line;
	int have_h2, have_h3;
	char station[SITE_CODE_LEN];
	char target[SITE_NAME_LEN];
	int in_session;			/* H4 seen, H8 not yet */
	int session_ok;			/* the H4 was good */
	size_t h4_line;
	int start_day_mjd;		/* MJD of the H4 start date */
	double start_sod;		/* seconds of day of the H4 start */
	double end_mjd;			/* NaN when the H4 has no end */
	int done;			/* H9 seen */
	size_t h9_line;
};

/* Record types we know; those not used are skipped and counted. */
static const char *const crd_known[] = {
	"H1", "H2", "H3", "H4", "H5", "H8", "H9", "C0", "C1", "C2", "C3",
	"C4", "C5", "C6", "C7", "00", "10", "11", "12", "20", "21", "30",
	"40", "41", "42", "50", "60",
};

static int
crd_known_type(const char *t)
{
	char u[3];

	if (strlen(t) != 2)
		return 0;
	u[0] = (char)toupper((unsigned char)t[0]);
	u[1] = (char)toupper((unsigned char)t[1]);
	u[2] = '\0';
	if (u[0] == '9' && isdigit((unsigned char)u[1]))
		return 1;	/* 90-99: user-defined */
	for (size_t i = 0; i < sizeof crd_known / sizeof crd_known[0]; i++)
		if (strcmp(u, crd_known[i]) == 0)
			return 1;
	return 0;
}

/*
 * UTC quasi-MJD of a CRD epoch.
 *
 * Given:
 *   y,m,d   int     UTC calendar date (Gregorian)
 *   sod     double  seconds of that UTC day, 0 <= sod < 86400, or up to
 *                   86401 on a day that ends with a leap second
 * Returned:
 *   mjd     double  UTC quasi-JD - 2400000.5 (ERFA's convention: on a
 *                   leap-second day the fraction runs over 86401 s)
 * Returned (function value):
 *   0, or -1 when the date or time does not exist (including 86400.x on
 *   a day without a leap second)
 * Notes:
 *   CRD epochs are UTC seconds of day (the H2 record's time-scale field
 *   names the UTC source; all are taken as UTC).  Precision: a double
 *   MJD resolves ~1 us, far below what the planner and audit use,
 *   though coarser than the CRD picosecond fields.
 * References:
 *   ILRS, Consolidated Laser Ranging Data Format (CRD) version 2,
 *   record 11; ERFA eraDtf2d.
 * Called:
 *   eraDtf2d
 */
static int
crd_mjd(int y, int m, int d, double sod, double *mjd)
{
	double d1, d2, sec;
	int hr, mn, st;

	if (!(sod >= 0.0) || sod >= 86401.0)
		return -1;
	if (sod >= 86400.0) {
		hr = 23;
		mn = 59;
		sec = sod - 86340.0;
	} else {
		hr = (int)(sod / 3600.0);
		mn = (int)((sod - hr * 3600.0) / 60.0);
		sec = sod - hr * 3600.0 - mn * 60.0;
		if (mn > 59)
			mn = 59;
		if (sec < 0.0)
			sec = 0.0;
	}
	st = eraDtf2d("UTC", y, m, d, hr, mn, sec, &d1, &d2);
	if (st < 0 || st == 2 || st == 3)
		return -1;
	*mjd = (d1 - ERFA_DJM0) + d2;
	return 0;
}

/* Six integer tokens y m d h m s from tok; 0 ok, -1 bad, 1 all "0"/"na". */
static int
crd_datetime(char **tok, long v[6])
{
	int unset = 1;

	for (int i = 0; i < 6; i++) {
		if (text_casecmp(tok[i], "na") == 0) {
			v[i] = 0;
			continue;
		}
		if (text_parse_long(tok[i], 0, 9999, &v[i]) != 0)
			return -1;
		if (v[i] != 0)
			unset = 0;
	}
	return unset ? 1 : 0;
}

/*
 * H2 (station) and H3 (target): the name in the first field, outside a
 * session.  A bad name clears *have, so the points that follow are
 * refused until a good header comes.
 */
static void
crd_name_header(struct crd_state *s, char **tok, size_t nt, size_t line,
    const char *type, const char *what, char *name, size_t len, int *have,
    struct import_report *rep)
{
	if (s->in_session) {
		import_err(rep, line, type, "%s header inside the session "
		    "opened on line %zu", what, s->h4_line);
		rep->bad++;
		return;
	}
	if (nt < 2 || strlen(tok[1]) >= len ||
	    !import_valid_ident(tok[1], len - 1, 1)) {
		import_err(rep, line, type, "missing or bad %s name", what);
		rep->bad++;
		*have = 0;
		return;
	}
	snprintf(name, len, "%s", tok[1]);
	*have = 1;
}

static void
crd_h4(struct crd_state *s, char **tok, size_t nt, size_t line,
    struct import_report *rep)
{
	long a[6], b[6], dtype;
	double smjd, d1, d2;
	int r;

	s->in_session = 1;
	s->session_ok = 0;
	s->h4_line = line;
	if (!s->have_h2 || !s->have_h3) {
		import_err(rep, line, "H4", "session header before the %s "
		    "record", s->have_h2 ? "H3 (target)" : "H2 (station)");
		rep->bad++;
		return;
	}
	if (nt < 14) {
		import_err(rep, line, "H4", "%zu fields; a session header has "
		    "at least 14 (type, start and end date and time)", nt);
		rep->bad++;
		return;
	}
	if (text_parse_long(tok[1], 0, 2, &dtype) != 0) {
		import_err(rep, line, "H4", "data type '%s' is not 0, 1 or 2",
		    tok[1]);
		rep->bad++;
		return;
	}
	if (crd_datetime(tok + 2, a) != 0 || a[3] > 23 || a[4] > 59 ||
	    a[5] > 60 || eraCal2jd((int)a[0], (int)a[1], (int)a[2], &d1,
	    &d2) != 0 || crd_mjd((int)a[0], (int)a[1], (int)a[2],
	    (double)(a[3] * 3600 + a[4] * 60 + a[5]), &smjd) != 0) {
		import_err(rep, line, "H4", "bad session start date or time");
		rep->bad++;
		return;
	}
	s->start_day_mjd = (int)d2;
	s->start_sod = (double)(a[3] * 3600 + a[4] * 60 + a[5]);
	s->end_mjd = NAN;
	r = crd_datetime(tok + 8, b);
	if (r < 0 || (r == 0 && (b[3] > 23 || b[4] > 59 || b[5] > 60 ||
	    crd_mjd((int)b[0], (int)b[1], (int)b[2],
	    (double)(b[3] * 3600 + b[4] * 60 + b[5]), &s->end_mjd) != 0))) {
		import_err(rep, line, "H4", "bad session end date or time");
		rep->bad++;
		return;
	}
	if (r == 0 && s->end_mjd < smjd) {
		import_err(rep, line, "H4", "session ends before it starts");
		rep->bad++;
		return;
	}
	if (r == 0 && s->end_mjd - smjd > 1.0) {
		import_err(rep, line, "H4", "session longer than one day");
		rep->bad++;
		return;
	}
	s->session_ok = 1;
}

/* A real field of record 11, or "na" for NaN when allowed. */
static int
crd_real(const char *t, int na_ok, double *v)
{
	if (na_ok && text_casecmp(t, "na") == 0) {
		*v = NAN;
		return 0;
	}
	return text_parse_real(t, -HUGE_VAL, HUGE_VAL, v);
}

static enum errcode
crd_np(struct crd_state *s, char **tok, size_t nt, size_t line,
    import_np_fn fn, void *ctx, struct import_report *rep)
{
	struct import_crd_np out;
	double sod, tof, rms, mjd;
	long count;
	int day;

	if (!s->in_session) {
		import_err(rep, line, "11", "normal point outside a session "
		    "(no H4 before it, or after H8)");
		rep->bad++;
		return ERRCODE_OK;
	}
	if (!s->session_ok) {
		import_err(rep, line, "11",
		    "the session header on line %zu is "
		    "invalid", s->h4_line);
		rep->bad++;
		return ERRCODE_OK;
	}
	if (nt < 13 || nt > (s->version == 1 ? 13u : 14u)) {
		import_err(rep, line, "11", "%zu fields; a version %d normal "
		    "point record has %s", nt, s->version, s->version == 1 ?
		    "13" : "13 or 14");
		rep->bad++;
		return ERRCODE_OK;
	}
	if (crd_real(tok[1], 0, &sod) != 0 || sod < 0.0 || sod >= 86401.0) {
		import_err(rep, line, "seconds_of_day", "'%.30s' is not a "
		    "number of seconds in 0..86400", tok[1]);
		rep->bad++;
		return ERRCODE_OK;
	}
	if (crd_real(tok[2], 0, &tof) != 0 || tof < CRD_TOF_MIN ||
	    tof > CRD_TOF_MAX) {
		import_err(rep, line, "time_of_flight",
		    "'%.30s' is not a lunar "
		    "two-way time of flight (%.1f..%.1f s)", tok[2],
		    CRD_TOF_MIN, CRD_TOF_MAX);
		rep->bad++;
		return ERRCODE_OK;
	}
	if (import_parse_count(tok[6], &count) != IMPORT_COUNT_OK) {
		import_err(rep, line, "return_count", "'%.30s' is not a whole "
		    "number >= 0", tok[6]);
		rep->bad++;
		return ERRCODE_OK;
	}
	if (crd_real(tok[7], 1, &rms) != 0 || rms < 0.0) {
		import_err(rep, line, "bin_rms", "'%.30s' is not a number of "
		    "picoseconds >= 0 (or na)", tok[7]);
		rep->bad++;
		return ERRCODE_OK;
	}
	/* the epoch is in the start's day unless the session crossed
	   midnight and the seconds of day wrapped */
	day = s->start_day_mjd;
	if (sod < s->start_sod - CRD_SLACK_S)
		day++;
	{
		int y, m, d;
		double fd;

		if (eraJd2cal(ERFA_DJM0, (double)day, &y, &m, &d, &fd) != 0 ||
		    crd_mjd(y, m, d, sod, &mjd) != 0) {
			import_err(rep, line, "seconds_of_day", "no such UTC "
			    "time in the session's day");
			rep->bad++;
			return ERRCODE_OK;
		}
	}
	if (!isnan(s->end_mjd) && mjd > s->end_mjd + CRD_SLACK_S / 86400.0) {
		import_err(rep, line, "seconds_of_day", "epoch after the end "
		    "of the session (H4 on line %zu)", s->h4_line);
		rep->bad++;
		return ERRCODE_OK;
	}
	memset(&out, 0, sizeof out);
	snprintf(out.target_name, sizeof out.target_name, "%s", s->target);
	snprintf(out.np.station_code, sizeof out.np.station_code, "%s",
	    s->station);
	out.np.epoch_mjd = mjd;
	out.np.tof_s = tof;
	out.np.photons = count;
	out.np.rms_ps = rms;
	out.np.synodic_deg = out.np.mean_elong_deg = NAN;
	out.np.target_el_deg = out.np.sun_el_target_deg = NAN;
	out.crd_version = s->version;
	out.session_line = s->h4_line;
	rep->records++;
	return fn(ctx, &out, line);
}

enum errcode
import_crd(const char *buf, size_t len, import_np_fn fn, void *ctx,
    struct import_report *rep)
{
	struct crd_state s;
	struct import_lines it;
	const char *ln;
	size_t n, nt;
	int term;
	char tb[LINE_MAX_CRD + CRD_MAX_TOKENS];
	char *tok[CRD_MAX_TOKENS];
	enum errcode rc;

	if ((rc = import_begin(buf, len, rep)) != ERRCODE_OK)
		return rc;
	memset(&s, 0, sizeof s);
	s.end_mjd = NAN;
	it.p = buf + import_bom_len(buf, len);
	it.end = buf + len;
	it.line = 0;
	while (import_lines_next(&it, &ln, &n, &term)) {
		char type[3];

		if (import_blank(ln, n))
			continue;
		if (n > LINE_MAX_CRD) {
			import_err(rep, it.line, "",
			    "line longer than %d bytes",
			    LINE_MAX_CRD);
			rep->bad++;
			continue;
		}
		nt = import_tokenize(ln, n, tb, sizeof tb, tok,
		    CRD_MAX_TOKENS);
		if (nt > CRD_MAX_TOKENS) {
			import_err(rep, it.line, "", "more than %d fields",
			    CRD_MAX_TOKENS);
			rep->bad++;
			continue;
		}
		if (!crd_known_type(tok[0])) {
			import_err(rep, it.line, "", "unknown record type "
			    "'%.10s'", tok[0]);
			rep->bad++;
			continue;
		}
		type[0] = (char)toupper((unsigned char)tok[0][0]);
		type[1] = (char)toupper((unsigned char)tok[0][1]);
		type[2] = '\0';
		if (s.done) {
			import_err(rep, it.line, type, "record after the H9 "
			    "end-of-file record on line %zu", s.h9_line);
			rep->bad++;
			continue;
		}
		if (s.version == 0 && strcmp(type, "H1") != 0) {
			import_err(rep, it.line, type,
			    "the first record must be "
			    "H1 (format header)");
			rep->bad++;
			s.version = -1;	/* report once */
			continue;
		}
		if (strcmp(type, "H1") == 0) {
			long v;

			if (s.version > 0) {
				import_err(rep, it.line, "H1",
				    "second H1 (the "
				    "first is on line %zu)", s.h1_line);
				rep->bad++;
				continue;
			}
			if (nt < 3 || text_casecmp(tok[1], "CRD") != 0 ||
			    text_parse_long(tok[2], 1, 2, &v) != 0) {
				import_err(rep, it.line, "H1",
				    "expected 'H1 CRD "
				    "1' or 'H1 CRD 2' (format and version)");
				rep->bad++;
				return import_status(rep);
			}
			s.version = (int)v;
			s.h1_line = it.line;
		} else if (s.version < 0) {
			continue;
		} else if (strcmp(type, "H2") == 0) {
			crd_name_header(&s, tok, nt, it.line, "H2", "station",
			    s.station, sizeof s.station, &s.have_h2, rep);
		} else if (strcmp(type, "H3") == 0) {
			crd_name_header(&s, tok, nt, it.line, "H3", "target",
			    s.target, sizeof s.target, &s.have_h3, rep);
		} else if (strcmp(type, "H4") == 0) {
			if (s.in_session) {
				import_err(rep, it.line, "H4", "new session "
				    "before H8 closed the one opened on line "
				    "%zu", s.h4_line);
				rep->bad++;
			}
			crd_h4(&s, tok, nt, it.line, rep);
		} else if (strcmp(type, "H8") == 0) {
			if (!s.in_session) {
				import_err(rep, it.line, "H8",
				    "end of session "
				    "without a session");
				rep->bad++;
			}
			s.in_session = 0;
		} else if (strcmp(type, "H9") == 0) {
			if (s.in_session) {
				import_err(rep, it.line, "H9", "end of file "
				    "before H8 closed the session opened on "
				    "line %zu", s.h4_line);
				rep->bad++;
			}
			s.done = 1;
			s.h9_line = it.line;
		} else if (strcmp(type, "11") == 0) {
			rc = crd_np(&s, tok, nt, it.line, fn, ctx, rep);
			if (rc != ERRCODE_OK)
				return rc;
		} else {
			rep->skipped++;
		}
	}
	if (s.version == 0) {
		import_err(rep, 0, "", "not a CRD file: no H1 record");
		rep->bad++;
	} else if (s.version > 0 && !s.done) {
		import_err(rep, it.line, "H9", "the file ends without the H9 "
		    "end-of-file record (truncated?)");
		rep->bad++;
	}
	return import_status(rep);
}
