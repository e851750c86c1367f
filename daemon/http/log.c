/* SPDX-License-Identifier: BSD-3-Clause */
/* log.c: timestamped event lines for the daemon, one whole line per write. */
#include <errno.h>
#include <stdarg.h>
#include <stdio.h>
#include <string.h>
#include <time.h>

#include "http/log.h"

/* Set once by log_init() before any thread starts; read-only afterwards. */
static enum log_level threshold = LOG_LEVEL_INFO;
static FILE *stream;

void
log_init(enum log_level level, FILE *f)
{
	threshold = level;
	stream = f;
}

const char *
log_level_name(enum log_level level)
{
	switch (level) {
	case LOG_LEVEL_DEBUG:
		return "debug";
	case LOG_LEVEL_INFO:
		return "info";
	case LOG_LEVEL_WARN:
		return "warn";
	case LOG_LEVEL_ERROR:
		return "error";
	}
	return "error";
}

int
log_level_parse(const char *name)
{
	for (int l = LOG_LEVEL_DEBUG; l <= LOG_LEVEL_ERROR; l++)
		if (name != NULL && strcmp(name, log_level_name(l)) == 0)
			return l;
	return -1;
}

static void vlog(enum log_level level, const char *suffix, const char *fmt,
    va_list ap) MEM_PRINTFLIKE(3, 0);

/* Format the whole line into one buffer, then write it with one call. */
static void
vlog(enum log_level level, const char *suffix, const char *fmt, va_list ap)
{
	char line[1024], stamp[40];
	struct timespec ts;
	struct tm tm;
	FILE *f = stream != NULL ? stream : stderr;
	size_t n;
	int k;

	if (level < threshold)
		return;
	clock_gettime(CLOCK_REALTIME, &ts);
	gmtime_r(&ts.tv_sec, &tm);
	strftime(stamp, sizeof stamp, "%Y-%m-%dT%H:%M:%S", &tm);
	k = snprintf(line, sizeof line, "%s.%03ldZ %-5s ", stamp,
	    ts.tv_nsec / 1000000L, log_level_name(level));
	n = k > 0 ? (size_t)k : 0;
	if (n < sizeof line) {
		k = vsnprintf(line + n, sizeof line - n, fmt, ap);
		n = k > 0 ? n + (size_t)k : n;
	}
	if (n < sizeof line && suffix != NULL) {
		k = snprintf(line + n, sizeof line - n, ": %s", suffix);
		n = k > 0 ? n + (size_t)k : n;
	}
	if (n >= sizeof line - 1)
		n = sizeof line - 2;	/* truncated: keep the line whole */
	/* One event, one line, nothing a terminal would act on: a request
	   path may carry any byte its client percent-encoded. */
	for (size_t i = 0; i < n; i++) {
		unsigned char c = (unsigned char)line[i];

		if (c == '\n' || c == '\r' || c == '\t')
			line[i] = ' ';
		else if (c < 0x20 || c == 0x7f)
			line[i] = '?';
	}
	line[n++] = '\n';
	fwrite(line, 1, n, f);
	fflush(f);
}

#define LOG_FN(fn, lvl)				\
void						\
fn(const char *fmt, ...)			\
{						\
	va_list ap;				\
						\
	va_start(ap, fmt);			\
	vlog(lvl, NULL, fmt, ap);		\
	va_end(ap);				\
}

LOG_FN(log_debug, LOG_LEVEL_DEBUG)
LOG_FN(log_info, LOG_LEVEL_INFO)
LOG_FN(log_warn, LOG_LEVEL_WARN)
LOG_FN(log_error, LOG_LEVEL_ERROR)

void
log_syserr(const char *fmt, ...)
{
	char msg[256];
	int saved = errno;
	va_list ap;

	strerror_r(saved, msg, sizeof msg);
	va_start(ap, fmt);
	vlog(LOG_LEVEL_ERROR, msg, fmt, ap);
	va_end(ap);
}
