/* SPDX-License-Identifier: BSD-3-Clause */
/* cli_store.h: what the commands working on the station database share:
   opening it, loading the site, deriving angles before an insert, files. */
#ifndef MOONRANGE_CLI_STORE_H
#define MOONRANGE_CLI_STORE_H

#include <stddef.h>
#include <stdio.h>

#include "cli/cli.h"
#include "core/derive.h"
#include "core/eop.h"
#include "core/geom.h"
#include "formats/import.h"
#include "core/mem.h"
#include "core/site.h"
#include "store/store.h"

/*
 * A command's view of the database: the connection, and once loaded the
 * station, every target and the EOP table (for derive.h).  Functions
 * returning int return a CLI_EXIT_* status and have already printed the
 * one-line error.
 */
struct cli_store {
	struct store *s;
	const char *path;
	struct site_station station;
	struct site_target *targets;	/* all, active or not */
	size_t ntargets;
	struct site_eop_row *eop;
	size_t neop;
	struct derive_cache *dc;	/* the fast path for the records of an
					   import (cli_store_load; may be NULL) */
};

/* Open --db (NULL: error "--db FILE is required"); flags of store_open. */
int cli_store_open(struct cli_store *c, const char *db, int flags);

/* Print "moonrange: error: ..." and return the exit status of rc
   (CLI_EXIT_USAGE for bad input, CLI_EXIT_FAIL otherwise). */
int cli_store_fail(enum errcode rc, const char *fmt, ...)
    MEM_PRINTFLIKE(2, 3);

/* Open path read-only for a query's run: CLI_EXIT_OK and *db (close it
   with store_close), else the status after "--db: no database 'PATH'"
   (usage) or "--db 'PATH': why". */
int cli_query_db(const char *path, struct store **db);

/* store_query_init, then the selection of the options --since, --until
   and --target of a (the log's and the normal points' lists). */
void cli_store_query(const struct cli_args *a, struct store_query *q);

/* Load station, targets and EOP table (the station must exist). */
int cli_store_load(struct cli_store *c);

/* Free what was loaded and close; c may be half-filled or zeroed. */
void cli_store_close(struct cli_store *c);

/*
 * The shape of a command on the database: open its --db with flags (of
 * store_open), run job, print its output, close.  A failed job prints
 * "moonrange: error: WHERE: sentence", WHERE being the database for a
 * read-only open and the command ("blackout add") otherwise, and gives
 * the exit status of its code; nothing goes to stdout then.
 */
int cli_store_run(const struct cli_args *a, int flags, cli_store_job *job,
    void *ctx);

/* The loaded target with this id, or NULL. */
const struct site_target *cli_store_target(const struct cli_store *c,
    const char *id);

/*
 * Fill the derived angles of an attempt (its target must be loaded) or a
 * normal point.  ERRCODE_NOT_FOUND for an unknown target; errbuf names
 * the field.
 */
enum errcode cli_store_derive_attempt(const struct cli_store *c,
    struct site_attempt *a, char *errbuf, size_t errlen);
enum errcode cli_store_derive_np(const struct cli_store *c,
    struct site_normal_point *np, char *errbuf, size_t errlen);

/*
 * Read a whole file into a new NUL-terminated buffer (free with
 * mem_free).  Files over max bytes are refused (ERRCODE_TOO_LARGE).
 * errbuf names the file.
 */
#define CLI_STORE_MAX_FILE (256u * 1024u * 1024u)
enum errcode cli_store_read_file(const char *path, size_t max, char **out,
    size_t *len, char *errbuf, size_t errlen);

/*
 * Add a bad record to an import report (errors of the store, unknown
 * targets) so that it is printed with the parser's, by line.
 */
void cli_store_rep_add(struct import_report *rep, size_t line,
    const char *field, const char *fmt, ...) MEM_PRINTFLIKE(4, 5);

/* Print every kept error of rep as "moonrange: error: FILE:LINE: ..."
   and a count of those not kept. */
void cli_store_rep_print(const struct import_report *rep, const char *file);

/*
 * Importers of whole files into an open, loaded store, inside the
 * caller's transaction (so init can load a site all or nothing).  Each
 * parses buf with import.h, derives the stored angles and inserts; every
 * bad record is reported (with the parser's) by file and line, and then
 * the status is CLI_EXIT_USAGE and the caller must roll back.  Records
 * already stored are counted as present and left alone.  Long files get
 * progress lines on stderr.  Targets and EOP rows reload the site so that
 * later files see them.
 */
struct cli_store_counts {
	size_t read;			/* good records in the file */
	size_t added;			/* stored now */
	size_t present;			/* already stored, skipped */
	size_t unused;			/* record types not used (CRD) */
};

/* Long files show "line N of M (P%)" on stderr when it is a terminal. */
int cli_store_import_station(struct cli_store *c, const char *file,
    const char *buf, size_t len);
int cli_store_import_targets(struct cli_store *c, const char *file,
    const char *buf, size_t len, struct cli_store_counts *n);
int cli_store_import_attempts(struct cli_store *c, const char *file,
    const char *buf, size_t len, struct cli_store_counts *n);
/* CRD normal points; prints one summary line per target to stdout
   unless quiet. */
int cli_store_import_crd(struct cli_store *c, const char *file,
    const char *buf, size_t len, int quiet, struct cli_store_counts *n);
/* IERS finals (c04 = 0) or C04 (c04 = 1). */
int cli_store_import_eop(struct cli_store *c, const char *file,
    const char *buf, size_t len, int c04, struct cli_store_counts *n);

/* Read a file and run one of the above in its own transaction.
   kind: 'a' attempts, 'n' CRD, 'e' finals, 'c' C04.  Ctrl-C (SIGINT)
   stops it: rolled back, "interrupted; nothing of it was stored" on
   stderr, CLI_EXIT_INTERRUPTED. */
int cli_store_import_file(struct cli_store *c, const char *file, int kind,
    struct cli_store_counts *n);

/*
 * The import commands (log import, np import): open a's --db for
 * writing, load it and import each operand with cli_store_import_file
 * (kind as there), in its own transaction, so that a bad file leaves the
 * others stored; said prints what a file that went in gave.  A failure
 * of the database, or an interruption (which stops at that file), wins
 * over bad input in the exit status.
 */
int cli_store_import_ops(const struct cli_args *a, int kind,
    void (*said)(const char *file, const struct cli_store_counts *n));

/*
 * A transaction of imports: cli_store_begin opens it (a CLI status);
 * until cli_store_end, SIGINT only sets a flag: the importers above stop
 * at the next record and give CLI_EXIT_INTERRUPTED (nothing printed).
 * cli_store_end takes the status st of the work done inside: CLI_EXIT_OK
 * (and no SIGINT came) commits, anything else rolls back, and an
 * interruption is said as "moonrange: error: WHAT: interrupted; LOST".
 * Returns the final status.
 */
int cli_store_begin(struct cli_store *c);
int cli_store_end(struct cli_store *c, int st, const char *what,
    const char *lost);

/* The loaded target whose alias is name, else whose id is name. */
const struct site_target *cli_store_target_by_alias(const struct cli_store *c,
    const char *name);

/* Refuse a station whose time zone is not in this system's zone
   database (its local times and nights could not be shown): one error
   line "WHERE: station.time_zone: ...", CLI_EXIT_USAGE; else
   CLI_EXIT_OK.  An empty zone is accepted (UTC only). */
int cli_store_check_zone(const struct site_station *st, const char *where);

#endif
