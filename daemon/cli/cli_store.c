/* SPDX-License-Identifier: BSD-3-Clause */
/* cli_store.c: opening the database for a command, loading the site and
   deriving the stored angles before an insert. */
#include <errno.h>
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <signal.h>
#include <string.h>
#include <time.h>
#include <unistd.h>

#include "cli/cli.h"
#include "core/text.h"
#include "cli/cli_store.h"
#include "core/derive.h"
#include "formats/render_time.h"
#include "query/qzone.h"

int
cli_store_open(struct cli_store *c, const char *db, int flags)
{
	char err[512];
	enum errcode rc;

	memset(c, 0, sizeof *c);
	if (db == NULL)
		return cli_usage_error("--db FILE is required");
	c->path = db;
	rc = store_open(db, flags, &c->s, err, sizeof err);
	if (rc != ERRCODE_OK)
		return rc == ERRCODE_NOT_FOUND ? cli_usage_error("%s", err) :
		    cli_fail("%s", err);
	return CLI_EXIT_OK;
}

int
cli_store_fail(enum errcode rc, const char *fmt, ...)
{
	va_list ap;

	va_start(ap, fmt);
	cli_vmessage("error", fmt, ap);
	va_end(ap);
	return cli_status_of(rc);
}

void
cli_store_query(const struct cli_args *a, struct store_query *q)
{
	store_query_init(q);
	q->since_mjd = cli_real(a, "since", NAN);
	q->until_mjd = cli_real(a, "until", NAN);
	q->target = cli_text(a, "target", NULL);
}

int
cli_store_load(struct cli_store *c)
{
	char err[512];
	enum errcode rc;

	if ((rc = store_station_get(c->s, &c->station, err, sizeof err)) ||
	    (rc = store_targets_list(c->s, 0, &c->targets, &c->ntargets, err,
	    sizeof err)) ||
	    (rc = store_eop_load(c->s, &c->eop, &c->neop, err, sizeof err)))
		return cli_fail("%s: %s", c->path, err);
	/* Without it, records are derived one by one on the direct path. */
	if ((c->dc = mem_alloc(sizeof *c->dc)) != NULL)
		derive_cache_init(c->dc);
	return CLI_EXIT_OK;
}

void
cli_store_close(struct cli_store *c)
{
	mem_free(c->targets);
	mem_free(c->eop);
	mem_free(c->dc);
	store_close(c->s);
	memset(c, 0, sizeof *c);
}

int
cli_query_db(const char *path, struct store **db)
{
	char err[300];
	enum errcode rc;

	rc = store_open(path, STORE_OPEN_READONLY, db, err, sizeof err);
	if (rc != ERRCODE_OK)
		return rc == ERRCODE_NOT_FOUND ?
		    cli_usage_error("--db: no database '%s'", path) :
		    cli_fail("--db '%s': %s", path, err);
	return CLI_EXIT_OK;
}

int
cli_store_run(const struct cli_args *a, int flags, cli_store_job *job,
    void *ctx)
{
	struct cli_store c;
	struct mbuf out;
	char err[512];
	int st;
	enum errcode rc;

	if ((st = cli_store_open(&c, cli_text(a, "db", NULL), flags)))
		return st;
	mbuf_init(&out);
	err[0] = '\0';
	if ((rc = job(&c, a, ctx, &out, err, sizeof err)) == ERRCODE_OK)
		st = cli_emit(&out);
	else if (err[0] == '\0')
		st = cli_fail("%s", errcode_str(rc));
	else
		st = cli_store_fail(rc, "%s: %s", (flags & STORE_OPEN_READONLY) ?
		    c.path : a->path, err);
	mbuf_free(&out);
	cli_store_close(&c);
	return st;
}

const struct site_target *
cli_store_target(const struct cli_store *c, const char *id)
{
	for (size_t i = 0; i < c->ntargets; i++)
		if (strcmp(c->targets[i].id, id) == 0)
			return &c->targets[i];
	return NULL;
}

/* The loaded target of id and the EOP row at mjd; NULL (errbuf names the
   field) for an unknown target. */
static const struct site_target *
derive_inputs(const struct cli_store *c, const char *id, double mjd,
    struct geom_eop *eop, char *errbuf, size_t errlen)
{
	const struct site_target *t = cli_store_target(c, id);

	if (t == NULL) {
		snprintf(errbuf, errlen, "field 'target': no target '%s' in "
		    "the database", id);
		return NULL;
	}
	(void)eop_lookup_rows(c->eop, c->neop, mjd, eop);
	return t;
}

/* rc; when it is an error, errbuf names the time field. */
static enum errcode
derive_status(enum errcode rc, const char *field, char *errbuf,
    size_t errlen)
{
	if (rc != ERRCODE_OK)
		snprintf(errbuf, errlen, "field '%s': cannot compute the "
		    "geometry (%s)", field, errcode_str(rc));
	return rc;
}

enum errcode
cli_store_derive_attempt(const struct cli_store *c, struct site_attempt *a,
    char *errbuf, size_t errlen)
{
	struct geom_eop eop;
	const struct site_target *t = derive_inputs(c, a->target,
	    0.5 * (a->start_mjd + a->end_mjd), &eop, errbuf, errlen);

	if (t == NULL)
		return ERRCODE_NOT_FOUND;
	return derive_status(c->dc != NULL ? derive_attempt_cached(c->dc,
	    &c->station, t, &eop, a) : derive_attempt(&c->station, t, &eop, a),
	    "start_utc", errbuf, errlen);
}

enum errcode
cli_store_derive_np(const struct cli_store *c, struct site_normal_point *np,
    char *errbuf, size_t errlen)
{
	struct geom_eop eop;
	const struct site_target *t = derive_inputs(c, np->target,
	    np->epoch_mjd, &eop, errbuf, errlen);
	enum errcode rc;

	if (t == NULL)
		return ERRCODE_NOT_FOUND;
	rc = c->dc != NULL ? derive_normal_point_cached(c->dc, &c->station, t,
	    &eop, np) : derive_normal_point(&c->station, t, &eop, np);
	/* The elevation is this station's: unknown for another's points. */
	if (strcmp(np->station_code, c->station.code) != 0)
		np->target_el_deg = NAN;
	return derive_status(rc, "epoch", errbuf, errlen);
}

enum errcode
cli_store_read_file(const char *path, size_t max, char **out, size_t *len,
    char *errbuf, size_t errlen)
{
	FILE *f;
	char *buf = NULL, *p;
	size_t cap = 0, n = 0, got;
	enum errcode rc = ERRCODE_OK;

	*out = NULL;
	*len = 0;
	if ((f = fopen(path, "rb")) == NULL) {
		int e = errno;

		snprintf(errbuf, errlen, "%s: cannot open: %s", path,
		    strerror(e));
		return e == ENOENT || e == ENOTDIR || e == EISDIR ?
		    ERRCODE_NOT_FOUND : ERRCODE_IO;
	}
	for (;;) {
		if (cap - n < 65536) {
			cap = cap ? cap * 2 : 65536;
			if ((p = mem_realloc(buf, cap + 1)) == NULL) {
				snprintf(errbuf, errlen, "%s: out of memory",
				    path);
				rc = ERRCODE_NOMEM;
				goto out;
			}
			buf = p;
		}
		got = fread(buf + n, 1, cap - n, f);
		n += got;
		if (n > max) {
			snprintf(errbuf, errlen, "%s: larger than %zu bytes",
			    path, max);
			rc = ERRCODE_TOO_LARGE;
			goto out;
		}
		if (got == 0)
			break;
	}
	if (ferror(f)) {
		int e = errno;

		/* fopen accepts a directory; reading it fails with EISDIR,
		   which is a wrong file name, not a failing disk. */
		snprintf(errbuf, errlen, "%s: %s", path, e == EISDIR ?
		    "is a directory, not a file" : strerror(e));
		rc = e == EISDIR ? ERRCODE_NOT_FOUND : ERRCODE_IO;
		goto out;
	}
	buf[n] = '\0';
	*out = buf;
	*len = n;
	buf = NULL;
out:
	mem_free(buf);
	fclose(f);
	return rc;
}

void
cli_store_rep_add(struct import_report *rep, size_t line, const char *field,
    const char *fmt, ...)
{
	va_list ap;

	rep->bad++;
	va_start(ap, fmt);
	import_verr(rep, line, field, fmt, ap);
	va_end(ap);
}

void
cli_store_rep_print(const struct import_report *rep, const char *file)
{
	char line[400];

	for (size_t i = 0; i < rep->nerrors; i++) {
		import_error_format(rep, i, file, line, sizeof line);
		(void)cli_store_fail(ERRCODE_BAD_ARG, "%s", line);
	}
	if (rep->bad > rep->nerrors)
		(void)cli_store_fail(ERRCODE_BAD_ARG,
		    "%s: %zu more bad records "
		    "not shown", file, rep->bad - rep->nerrors);
}

const struct site_target *
cli_store_target_by_alias(const struct cli_store *c, const char *name)
{
	for (size_t i = 0; i < c->ntargets; i++)
		if (c->targets[i].alias[0] != '\0' &&
		    strcmp(c->targets[i].alias, name) == 0)
			return &c->targets[i];
	return cli_store_target(c, name);
}

/* --- importers ------------------------------------------------------------ */

/* A file this long shows its progress (on a terminal only). */
#define PROGRESS_BYTES (512u * 1024u)
#define PROGRESS_S 0.25		/* seconds between updates */

/* --- interruption ------------------------------------------------------------
 * An import is one transaction: Ctrl-C (SIGINT) while it runs sets a
 * flag; the parse stops at the next record, the transaction is rolled
 * back, and the command says that nothing was stored. */

static volatile sig_atomic_t interrupted;
static struct sigaction old_int;
static int int_depth;

static void
on_sigint(int sig)
{
	(void)sig;
	interrupted = 1;
}

static void
interrupt_begin(void)
{
	struct sigaction sa;

	if (int_depth++ > 0)
		return;
	interrupted = 0;
	memset(&sa, 0, sizeof sa);
	sa.sa_handler = on_sigint;
	sigemptyset(&sa.sa_mask);
	(void)sigaction(SIGINT, &sa, &old_int);
}

static void
interrupt_end(void)
{
	if (int_depth > 0 && --int_depth == 0)
		(void)sigaction(SIGINT, &old_int, NULL);
}

int
cli_store_begin(struct cli_store *c)
{
	char err[512];

	if (store_begin(c->s, err, sizeof err) != ERRCODE_OK)
		return cli_fail("%s: %s", c->path, err);
	interrupt_begin();
	return CLI_EXIT_OK;
}

int
cli_store_end(struct cli_store *c, int st, const char *what,
    const char *lost)
{
	char err[512];

	if (st == CLI_EXIT_OK && interrupted)
		st = CLI_EXIT_INTERRUPTED;
	if (st == CLI_EXIT_OK && store_commit(c->s, err, sizeof err) !=
	    ERRCODE_OK)
		st = cli_fail("%s: %s", c->path, err);
	if (st != CLI_EXIT_OK)
		store_rollback(c->s);
	if (st == CLI_EXIT_INTERRUPTED)
		(void)cli_fail("%s: interrupted; %s", what, lost);
	interrupt_end();
	return st;
}

/* Per-target tallies of a CRD file (its summary). */
#define CRD_MAX_TALLY 64

struct job {
	struct cli_store *c;
	struct import_report *rep;
	const char *file;
	struct cli_store_counts *n;
	int progress;			/* show it (a long file, a terminal) */
	size_t lines;			/* lines of the file */
	double next;			/* monotonic time of the next update */
	int shown;			/* width of the progress line shown */
	struct {
		char id[SITE_ID_LEN];
		size_t added, present;
	} tally[CRD_MAX_TALLY];
	size_t ntally;
};

static double
mono_s(void)
{
	struct timespec t;

	clock_gettime(CLOCK_MONOTONIC, &t);
	return (double)t.tv_sec + (double)t.tv_nsec / 1e9;
}

/* One record at line: count it, show progress; 1 when interrupted (the
   callback then stops the parse). */
static int
job_seen(struct job *j, size_t line)
{
	double now;

	j->n->read++;
	if (interrupted)
		return 1;
	if (j->progress && (now = mono_s()) >= j->next) {
		j->next = now + PROGRESS_S;
		j->shown = fprintf(stderr, "\rmoonrange: %s: line %zu of %zu "
		    "(%.0f%%)", j->file, line, j->lines, j->lines ? 100.0 *
		    (double)line / (double)j->lines : 100.0);
		fflush(stderr);
	}
	return 0;
}

/* Clear the progress line. */
static void
job_progress_done(struct job *j)
{
	if (j->shown > 0)
		fprintf(stderr, "\r%*s\r", j->shown, "");
	j->shown = 0;
}

/*
 * The outcome of one insert: counted, reported against its line, or (for
 * a failure of the database itself) returned to stop the parse.
 */
static enum errcode
job_result(struct job *j, enum errcode rc, size_t line, const char *err)
{
	switch (rc) {
	case ERRCODE_OK:
		j->n->added++;
		return ERRCODE_OK;
	case ERRCODE_EXISTS:
		j->n->present++;
		return ERRCODE_OK;
	case ERRCODE_NOMEM:
	case ERRCODE_DB:
	case ERRCODE_IO:
		cli_store_rep_add(j->rep, line, "", "%s", err);
		return rc;
	case ERRCODE_BAD_ARG:
	case ERRCODE_BAD_TIME:
	case ERRCODE_CONFIG:
	case ERRCODE_NOT_FOUND:
	case ERRCODE_AUTH:
	case ERRCODE_TOO_LARGE:
	case ERRCODE_UNSUPPORTED:
	case ERRCODE_NO_CONVERGE:
	case ERRCODE_METHOD:
	case ERRCODE__LAST:
		break;
	}
	cli_store_rep_add(j->rep, line, "", "%s", err);
	return ERRCODE_OK;
}

static enum errcode
one_target(void *ctx, const struct site_target *t, size_t line)
{
	struct job *j = ctx;
	char err[512];

	if (job_seen(j, line))
		return ERRCODE_IO;
	return job_result(j, store_target_add(j->c->s, t, err, sizeof err),
	    line, err);
}

static enum errcode
one_attempt(void *ctx, const struct site_attempt *in, size_t line)
{
	struct job *j = ctx;
	struct site_attempt a = *in;
	char err[512];
	enum errcode rc;

	if (job_seen(j, line))
		return ERRCODE_IO;
	if (cli_store_target(j->c, a.target) == NULL) {
		cli_store_rep_add(j->rep, line, "target", "no target '%s' in "
		    "the database", a.target);
		return ERRCODE_OK;
	}
	if ((rc = cli_store_derive_attempt(j->c, &a, err, sizeof err)) ==
	    ERRCODE_OK)
		rc = store_attempt_add(j->c->s, &a, err, sizeof err);
	return job_result(j, rc, line, err);
}

static enum errcode
one_np(void *ctx, const struct import_crd_np *in, size_t line)
{
	struct job *j = ctx;
	struct site_normal_point np = in->np;
	const struct site_target *t;
	char err[512];
	enum errcode rc;
	size_t k;
	int inserted = 0;

	if (job_seen(j, line))
		return ERRCODE_IO;
	if ((t = cli_store_target_by_alias(j->c, in->target_name)) == NULL) {
		cli_store_rep_add(j->rep, line, "target", "no target has the "
		    "alias or id '%s'", in->target_name);
		return ERRCODE_OK;
	}
	snprintf(np.target, sizeof np.target, "%s", t->id);
	if ((rc = cli_store_derive_np(j->c, &np, err, sizeof err)) ==
	    ERRCODE_OK)
		rc = store_np_add(j->c->s, &np, &inserted, err, sizeof err);
	if (rc == ERRCODE_OK && !inserted)
		rc = ERRCODE_EXISTS;
	for (k = 0; k < j->ntally; k++)
		if (strcmp(j->tally[k].id, t->id) == 0)
			break;
	if (k == j->ntally && k < CRD_MAX_TALLY) {
		snprintf(j->tally[k].id, sizeof j->tally[k].id, "%s", t->id);
		j->ntally++;
	}
	if (k < j->ntally) {
		j->tally[k].added += rc == ERRCODE_OK;
		j->tally[k].present += rc == ERRCODE_EXISTS;
	}
	return job_result(j, rc, line, err);
}

static enum errcode
one_eop(void *ctx, const struct site_eop_row *r, size_t line)
{
	struct job *j = ctx;
	char err[512];

	if (job_seen(j, line))
		return ERRCODE_IO;
	return job_result(j, store_eop_put(j->c->s, r, err, sizeof err), line,
	    err);
}

/* Run a parse with a job; print its errors; a CLI status. */
static int
run_job(struct cli_store *c, const char *file, size_t len, int kind,
    const char *buf, struct cli_store_counts *n, int quiet)
{
	struct job *j;
	struct import_report *rep;
	enum errcode rc = ERRCODE_NOMEM;
	int st;

	memset(n, 0, sizeof *n);
	j = mem_calloc(1, sizeof *j);
	rep = mem_alloc(sizeof *rep);
	if (j == NULL || rep == NULL) {
		mem_free(j);
		mem_free(rep);
		return cli_fail("%s: out of memory", file);
	}
	import_report_init(rep);
	j->c = c;
	j->rep = rep;
	j->file = file;
	j->n = n;
	j->progress = len > PROGRESS_BYTES && isatty(STDERR_FILENO);
	for (size_t k = 0; j->progress && k < len; k++)
		j->lines += buf[k] == '\n';
	j->next = mono_s();
	switch (kind) {
	case 't':
		rc = import_targets_csv(buf, len, one_target, j, rep);
		break;
	case 'a':
		rc = import_attempts_csv(buf, len, one_attempt, j, rep);
		break;
	case 'n':
		rc = import_crd(buf, len, one_np, j, rep);
		break;
	case 'e':
		rc = import_eop_finals(buf, len, one_eop, j, rep);
		break;
	case 'c':
		rc = import_eop_c04(buf, len, one_eop, j, rep);
		break;
	default:
		break;
	}
	n->unused = rep->skipped;
	job_progress_done(j);
	if (interrupted) {
		st = CLI_EXIT_INTERRUPTED;
	} else if (rc == ERRCODE_NOMEM || rc == ERRCODE_DB) {
		cli_store_rep_print(rep, file);
		st = cli_fail("%s: the database failed during the import (%s)",
		    file, errcode_str(rc));
	} else if (rc != ERRCODE_OK || rep->bad > 0 || rep->nerrors > 0) {
		cli_store_rep_print(rep, file);
		st = cli_usage_error("%s: %zu bad record%s; nothing imported",
		    file, rep->bad, rep->bad == 1 ? "" : "s");
	} else {
		st = CLI_EXIT_OK;
		for (size_t k = 0; kind == 'n' && !quiet && k < j->ntally; k++)
			printf("%s: target %s: %zu normal point%s added, %zu "
			    "already present\n", file, j->tally[k].id,
			    j->tally[k].added, j->tally[k].added == 1 ? "" :
			    "s", j->tally[k].present);
	}
	mem_free(rep);
	mem_free(j);
	/* Later files of the same transaction see what this one added. */
	if (st == CLI_EXIT_OK && (kind == 't' || kind == 'e' || kind == 'c')) {
		mem_free(c->targets);
		mem_free(c->eop);
		mem_free(c->dc);	/* cli_store_load makes a new one */
		c->targets = NULL;
		c->eop = NULL;
		c->dc = NULL;
		st = cli_store_load(c);
	}
	return st;
}

int
cli_store_import_station(struct cli_store *c, const char *file,
    const char *buf, size_t len)
{
	struct import_report *rep;
	struct site_station st;
	char err[512];
	enum errcode rc;
	int status = CLI_EXIT_OK;

	if ((rep = mem_alloc(sizeof *rep)) == NULL)
		return cli_fail("%s: out of memory", file);
	import_report_init(rep);
	rc = import_station_ini(buf, len, &st, rep);
	if (rc != ERRCODE_OK || rep->bad > 0 || rep->nerrors > 0) {
		cli_store_rep_print(rep, file);
		status = cli_usage_error("%s: the station file has errors; "
		    "nothing imported", file);
	} else if ((rc = store_station_put(c->s, &st, err, sizeof err))) {
		status = cli_store_fail(rc, "%s: %s", file, err);
	}
	mem_free(rep);
	if (status == CLI_EXIT_OK)
		c->station = st;
	return status;
}

int
cli_store_import_targets(struct cli_store *c, const char *file,
    const char *buf, size_t len, struct cli_store_counts *n)
{
	return run_job(c, file, len, 't', buf, n, 1);
}

int
cli_store_import_attempts(struct cli_store *c, const char *file,
    const char *buf, size_t len, struct cli_store_counts *n)
{
	return run_job(c, file, len, 'a', buf, n, 1);
}

int
cli_store_import_crd(struct cli_store *c, const char *file, const char *buf,
    size_t len, int quiet, struct cli_store_counts *n)
{
	return run_job(c, file, len, 'n', buf, n, quiet);
}

int
cli_store_import_eop(struct cli_store *c, const char *file, const char *buf,
    size_t len, int c04, struct cli_store_counts *n)
{
	return run_job(c, file, len, c04 ? 'c' : 'e', buf, n, 1);
}

int
cli_store_import_file(struct cli_store *c, const char *file, int kind,
    struct cli_store_counts *n)
{
	char *buf = NULL, err[512];
	size_t len = 0;
	enum errcode rc;
	int st;

	memset(n, 0, sizeof *n);
	if ((rc = cli_store_read_file(file, CLI_STORE_MAX_FILE, &buf, &len, err,
	    sizeof err)))
		return cli_store_fail(rc, "%s", err);
	if ((st = cli_store_begin(c)) == CLI_EXIT_OK)
		st = cli_store_end(c, run_job(c, file, len, kind, buf, n, 0),
		    file, "nothing of it was stored (the import is one "
		    "transaction)");
	mem_free(buf);
	return st;
}

int
cli_store_import_ops(const struct cli_args *a, int kind,
    void (*said)(const char *file, const struct cli_store_counts *n))
{
	struct cli_store c;
	struct cli_store_counts n;
	int st;

	if ((st = cli_store_open(&c, cli_text(a, "db", NULL), 0)))
		return st;
	if ((st = cli_store_load(&c)) != CLI_EXIT_OK)
		goto out;
	for (int i = 0; i < a->nops; i++) {
		int fst = cli_store_import_file(&c, a->ops[i], kind, &n);

		if (fst == CLI_EXIT_OK)
			said(a->ops[i], &n);
		else if (st == CLI_EXIT_OK || fst == CLI_EXIT_FAIL ||
		    fst == CLI_EXIT_INTERRUPTED)
			st = fst;
		if (fst == CLI_EXIT_INTERRUPTED)
			break;		/* the files before it are stored */
	}
out:
	cli_store_close(&c);
	return st;
}

int
cli_store_check_zone(const struct site_station *st, const char *where)
{
	if (st->time_zone[0] != '\0' && !qzone_known(st->time_zone))
		return cli_usage_error("%s: station.time_zone: '%s' is not a "
		    "time zone known to this system (an IANA name such as "
		    "America/Denver; is tzdata installed?)", where,
		    st->time_zone);
	return CLI_EXIT_OK;
}
