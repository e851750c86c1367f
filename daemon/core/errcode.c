/* SPDX-License-Identifier: BSD-3-Clause */
/* errcode.c: messages, names and the internal/input split of the status
   codes in errcode.h. */
#include "core/errcode.h"

const char *
errcode_str(enum errcode code)
{
	switch (code) {
	case ERRCODE_OK:
		return "success";
	case ERRCODE_NOMEM:
		return "out of memory";
	case ERRCODE_BAD_ARG:
		return "invalid value";
	case ERRCODE_BAD_TIME:
		return "invalid or unconvertible time";
	case ERRCODE_CONFIG:
		return "invalid station configuration";
	case ERRCODE_DB:
		return "database error";
	case ERRCODE_NOT_FOUND:
		return "not found";
	case ERRCODE_IO:
		return "input/output error";
	case ERRCODE_EXISTS:
		return "already exists";
	case ERRCODE_AUTH:
		return "authorization required";
	case ERRCODE_TOO_LARGE:
		return "input too large";
	case ERRCODE_UNSUPPORTED:
		return "not supported";
	case ERRCODE_NO_CONVERGE:
		return "search did not converge";
	case ERRCODE_METHOD:
		return "method not allowed";
	case ERRCODE__LAST:
		break;
	}
	return "unknown error";
}

const char *
errcode_name(enum errcode code)
{
	switch (code) {
	case ERRCODE_OK:
		return "ok";
	case ERRCODE_NOMEM:
		return "nomem";
	case ERRCODE_BAD_ARG:
		return "bad_arg";
	case ERRCODE_BAD_TIME:
		return "bad_time";
	case ERRCODE_CONFIG:
		return "config";
	case ERRCODE_DB:
		return "db";
	case ERRCODE_NOT_FOUND:
		return "not_found";
	case ERRCODE_IO:
		return "io";
	case ERRCODE_EXISTS:
		return "exists";
	case ERRCODE_AUTH:
		return "auth";
	case ERRCODE_TOO_LARGE:
		return "too_large";
	case ERRCODE_UNSUPPORTED:
		return "unsupported";
	case ERRCODE_NO_CONVERGE:
		return "no_converge";
	case ERRCODE_METHOD:
		return "method";
	case ERRCODE__LAST:
		break;
	}
	return "unknown";
}

int
errcode_is_internal(enum errcode code)
{
	switch (code) {
	case ERRCODE_OK:
	case ERRCODE_BAD_ARG:
	case ERRCODE_BAD_TIME:
	case ERRCODE_CONFIG:
	case ERRCODE_NOT_FOUND:
	case ERRCODE_EXISTS:
	case ERRCODE_AUTH:
	case ERRCODE_TOO_LARGE:
	case ERRCODE_UNSUPPORTED:
	case ERRCODE_METHOD:
		return 0;
	case ERRCODE_NOMEM:
	case ERRCODE_DB:
	case ERRCODE_IO:
	case ERRCODE_NO_CONVERGE:
	case ERRCODE__LAST:
		break;
	}
	return 1;
}
