/* SPDX-License-Identifier: BSD-3-Clause */
/* log.h: timestamped one-line event log on stderr, with a level set at start. */
#ifndef MOONRANGE_LOG_H
#define MOONRANGE_LOG_H

#include <stdio.h>

#include "core/mem.h"

/*
 * Every line reads "2027-03-01T04:00:00.123Z LEVEL message".  Lines below
 * the level set with log_init() are dropped.  Safe to call from several
 * threads: each line is written whole, with control characters replaced
 * (line breaks and tabs by a space, others by "?").  The log never sees
 * a credential; callers must not pass one.
 */
enum log_level {
	LOG_LEVEL_DEBUG = 0,
	LOG_LEVEL_INFO,
	LOG_LEVEL_WARN,
	LOG_LEVEL_ERROR
};

/* Set the threshold and the stream (NULL = stderr).  Call before threads. */
void log_init(enum log_level level, FILE *stream);

/* "debug" "info" "warn" "error" -> level; -1 for an unknown name. */
int log_level_parse(const char *name);
const char *log_level_name(enum log_level level);

void log_debug(const char *fmt, ...) MEM_PRINTFLIKE(1, 2);
void log_info(const char *fmt, ...) MEM_PRINTFLIKE(1, 2);
void log_warn(const char *fmt, ...) MEM_PRINTFLIKE(1, 2);
void log_error(const char *fmt, ...) MEM_PRINTFLIKE(1, 2);

/* An error line ending in ": " and strerror(errno) of the errno at the call. */
void log_syserr(const char *fmt, ...) MEM_PRINTFLIKE(1, 2);

#endif
