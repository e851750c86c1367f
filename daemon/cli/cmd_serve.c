/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_serve.c: "moonrange serve", the daemon: HTTP API, page, plan refresh, signals. */
#include <errno.h>
#include <malloc.h>
#include <signal.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <time.h>
#include <unistd.h>

#include "http/api.h"
#include "cli/cli.h"
#include "cli/cmd_run.h"
#include "http/log.h"
#include "store/store.h"
#include "core/tscale.h"
#include "http/web.h"

#define SERVE_REFRESH_DEFAULT 600.0	/* seconds between plan refreshes */
#define SERVE_GRACE_S 10.0		/* wait for requests in flight */

static const char *default_web_dir(void);

/* The defaults that are known only at run time, for --help. */
void
cmd_serve_more(FILE *f)
{
	fprintf(f, "\nDefaults: --listen %s:%d (port 0 picks a free one), "
	    "--web\n%s, --refresh %.0f. A token has at least %d\n"
	    "characters.\n", WEB_DEFAULT_ADDR, WEB_DEFAULT_PORT,
	    default_web_dir(), SERVE_REFRESH_DEFAULT, API_TOKEN_MIN);
}

/* The page: the installed copy if there is one, else the source tree's. */
static const char *
default_web_dir(void)
{
	struct stat st;

	if (stat(MOONRANGE_INSTALL_WEB_DIR "/index.html", &st) == 0)
		return MOONRANGE_INSTALL_WEB_DIR;
	return MOONRANGE_SOURCE_DIR "/web";
}

/* Read the token: one line, trailing white space dropped. */
static int
read_token(const char *path, char *buf, size_t len)
{
	FILE *f = fopen(path, "r");
	struct stat st;
	size_t n;

	if (f == NULL)
		return cli_fail("--token-file '%s': %s", path, strerror(errno));
	if (fstat(fileno(f), &st) != 0 || !S_ISREG(st.st_mode)) {
		fclose(f);
		return cli_fail("--token-file '%s': not a regular file", path);
	}
	n = fread(buf, 1, len - 1, f);
	fclose(f);
	buf[n] = '\0';
	while (n > 0 && (buf[n - 1] == '\n' || buf[n - 1] == '\r' ||
	    buf[n - 1] == ' ' || buf[n - 1] == '\t'))
		buf[--n] = '\0';
	if (n < API_TOKEN_MIN || n > API_TOKEN_MAX || strchr(buf, '\n') ||
	    strchr(buf, ' '))
		return cli_usage_error("--token-file '%s': expected one line of "
		    "%d..%d characters without spaces", path, API_TOKEN_MIN,
		    API_TOKEN_MAX);
	if (st.st_mode & (S_IRWXG | S_IRWXO))
		log_warn("token file %s is readable by others than its owner",
		    path);
	return CLI_EXIT_OK;
}

/* Load station, targets and EOP rows from the store into a snapshot. */
static enum errcode
load_site(struct store *db, struct api_site *site, char *err, size_t errlen)
{
	enum errcode rc;

	memset(site, 0, sizeof *site);
	rc = store_station_get(db, &site->station, err, errlen);
	if (rc == ERRCODE_OK)
		rc = store_targets_list(db, 0, &site->targets, &site->ntargets,
		    err, errlen);
	if (rc == ERRCODE_OK)
		rc = store_eop_load(db, &site->eop, &site->neop, err, errlen);
	if (rc != ERRCODE_OK)
		api_site_free(site);
	return rc;
}

/*
 * The SIGHUP reload: the site read on a read-only connection of its own,
 * opened and closed here.  The daemon's shared connection belongs to the
 * request handlers (under the API's lock); reading it from this thread
 * raced them (a use-after-free inside SQLite under concurrent POSTs).
 */
static enum errcode
reload_site(const char *db_path, struct api_site *site, char *err,
    size_t errlen)
{
	struct store *ro = NULL;
	enum errcode rc;

	memset(site, 0, sizeof *site);
	rc = store_open(db_path, STORE_OPEN_READONLY, &ro, err, errlen);
	if (rc == ERRCODE_OK)
		rc = load_site(ro, site, err, errlen);
	store_close(ro);
	return rc;
}

static void
utc_now(double *u1, double *u2)
{
	cli_now(u1, u2);
}

static double
mono_s(void)
{
	struct timespec t;

	clock_gettime(CLOCK_MONOTONIC, &t);
	return (double)t.tv_sec + (double)t.tv_nsec / 1e9;
}

static void
replan(struct api_ctx *ctx, const char *why)
{
	double u1, u2, t0 = mono_s();
	char err[300] = "";
	enum errcode rc;

	utc_now(&u1, &u2);
	rc = api_replan(ctx, u1, u2, err, sizeof err);
	if (rc != ERRCODE_OK)
		log_error("plan refresh (%s) failed: %s: %s", why,
		    errcode_str(rc), err);
	else
		log_info("plan refreshed (%s) in %.0f ms", why,
		    (mono_s() - t0) * 1e3);
}

int
cmd_serve(const struct cli_args *a)
{
	const char *db_path = cli_text(a, "db", NULL);
	const char *web_dir = cli_text(a, "web", NULL);
	const char *token_file = cli_text(a, "token-file", NULL);
	char addr[64] = WEB_DEFAULT_ADDR, err[300];
	char token[API_TOKEN_MAX + 2];
	unsigned port = WEB_DEFAULT_PORT;
	double refresh = cli_real(a, "refresh", SERVE_REFRESH_DEFAULT), next;
	int level = LOG_LEVEL_INFO;
	int st = CLI_EXIT_FAIL, sig;
	struct store *db = NULL;
	struct api_ctx *ctx = NULL;
	struct web_server *srv = NULL;
	struct api_config cfg;
	struct api_site site;
	struct web_config wc;
	sigset_t set;
	enum errcode rc;

	token[0] = '\0';
	/* One malloc arena for every handler thread: with one per thread,
	   each keeps the peak of the largest query it ran (four 10-year
	   window queries at once raised the daemon to 237 MB); with the
	   turn taking of long queries (api_plan.c) the peak is that of one.
	   tests/load/heavy_rss.sh measures it. */
	(void)mallopt(M_ARENA_MAX, 1);
	if (cli_given(a, "listen") && web_parse_listen(cli_text(a, "listen",
	    NULL), addr, sizeof addr, &port, err, sizeof err))
		return cli_usage_error("%s", err);
	if (cli_given(a, "log-level"))
		level = log_level_parse(cli_text(a, "log-level", NULL));
	if (!web_is_loopback(addr) && token_file == NULL)
		return cli_usage_error("--listen %s: an address other than "
		    "loopback needs --token-file", addr);
	log_init((enum log_level)level, NULL);
	if (token_file != NULL &&
	    (st = read_token(token_file, token, sizeof token)) != CLI_EXIT_OK)
		return st;
	st = CLI_EXIT_FAIL;

	rc = store_open(db_path, 0, &db, err, sizeof err);
	if (rc != ERRCODE_OK) {
		st = cli_status_of(rc);
		cli_fail("--db '%s': %s", db_path, err);
		goto out;
	}
	if ((rc = load_site(db, &site, err, sizeof err)) != ERRCODE_OK) {
		st = cli_status_of(rc);
		cli_fail("--db '%s': %s (run 'moonrange init' first)", db_path,
		    err);
		goto out;
	}
	memset(&cfg, 0, sizeof cfg);
	cfg.db_path = db_path;
	cfg.token = token[0] ? token : NULL;
	cfg.token_file = token[0] ? token_file : NULL;
	/* A file the daemon may not write (mode 0444, a read-only mount):
	   say so at once instead of a 500 on the first POST. */
	if (access(db_path, W_OK) != 0) {
		cfg.db_read_only = 1;
		log_warn("%s cannot be written (%s): writes are disabled",
		    db_path, strerror(errno));
	}
	cfg.refresh_s = refresh;
	cfg.start_posix = (double)time(NULL);
	cfg.plan_days = 0;
	if ((ctx = api_new(&cfg)) == NULL) {
		api_site_free(&site);
		cli_fail("%s", errcode_str(ERRCODE_NOMEM));
		goto out;
	}
	api_set_site(ctx, &site);
	api_set_store(ctx, db);

	/* Signals are taken synchronously by this thread alone: block them
	   before the server's threads start, so those inherit the mask. */
	sigemptyset(&set);
	sigaddset(&set, SIGINT);
	sigaddset(&set, SIGTERM);
	sigaddset(&set, SIGHUP);
	pthread_sigmask(SIG_BLOCK, &set, NULL);
	signal(SIGPIPE, SIG_IGN);

	memset(&wc, 0, sizeof wc);
	wc.addr = addr;
	wc.port = port;
	wc.web_dir = web_dir ? web_dir : default_web_dir();
	if (web_start(&wc, ctx, &srv, err, sizeof err) != ERRCODE_OK) {
		if (errno == EADDRINUSE)
			cli_fail("--listen: %s; another program holds the port "
			    "(try --listen 127.0.0.1:0 for a free one)", err);
		else
			cli_fail("--listen: %s", err);
		goto out;
	}
	log_info("moonrange %s serving %s on %s port %u, page from %s, writes "
	    "%s%s%s", MOONRANGE_VERSION, db_path, addr, web_port(srv),
	    wc.web_dir, token[0] ? "enabled (token file " :
	    "disabled (no token file)", token[0] ? token_file : "",
	    token[0] ? ")" : "");
	if (strchr(addr, ':') != NULL)
		printf("moonrange: serving http://[%s]:%u/\n", addr,
		    web_port(srv));
	else
		printf("moonrange: serving http://%s:%u/\n", addr,
		    web_port(srv));
	fflush(stdout);

	replan(ctx, "start");
	next = mono_s() + refresh;
	for (;;) {
		struct timespec tick = {1, 0};

		sig = sigtimedwait(&set, NULL, &tick);
		if (sig == SIGINT || sig == SIGTERM) {
			log_info("signal %s: shutting down",
			    sig == SIGINT ? "SIGINT" : "SIGTERM");
			break;
		}
		if (sig == SIGHUP) {
			rc = reload_site(db_path, &site, err, sizeof err);
			if (rc != ERRCODE_OK) {
				log_error("SIGHUP: site not reloaded, keeping "
				    "the old one: %s", err);
			} else {
				log_info("SIGHUP: site reloaded (%zu targets, "
				    "%zu EOP rows)", site.ntargets, site.neop);
				api_set_site(ctx, &site);
			}
		}
		if (api_replan_wanted(ctx)) {
			replan(ctx, "data changed");
			next = mono_s() + refresh;
		} else if (mono_s() >= next) {
			replan(ctx, "interval");
			next = mono_s() + refresh;
		}
	}
	st = CLI_EXIT_OK;
out:
	web_stop(srv, SERVE_GRACE_S);
	api_free(ctx);
	store_close(db);
	memset(token, 0, sizeof token);
	if (st == CLI_EXIT_OK)
		log_info("stopped, database closed");
	return st;
}
