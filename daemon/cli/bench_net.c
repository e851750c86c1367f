/* SPDX-License-Identifier: BSD-3-Clause */
/* bench_net.c: process and loopback helpers of "moonrange bench": a free
   port, waiting for a daemon to listen, wrk's durations, peak memory. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>
#include <unistd.h>

#include <arpa/inet.h>
#include <netinet/in.h>
#include <sys/socket.h>

#include "cli/bench_net.h"

/* A free loopback TCP port, or 0. */
int
bench_free_port(void)
{
	struct sockaddr_in sa;
	socklen_t len = sizeof sa;
	int fd = socket(AF_INET, SOCK_STREAM, 0), port = 0;

	if (fd < 0)
		return 0;
	memset(&sa, 0, sizeof sa);
	sa.sin_family = AF_INET;
	sa.sin_addr.s_addr = htonl(INADDR_LOOPBACK);
	if (bind(fd, (struct sockaddr *)&sa, sizeof sa) == 0 &&
	    getsockname(fd, (struct sockaddr *)&sa, &len) == 0)
		port = ntohs(sa.sin_port);
	close(fd);
	return port;
}

/* 1 once something accepts on the loopback port (polled for 120 s). */
int
bench_wait_port(int port)
{
	for (int i = 0; i < 1200; i++) {
		struct sockaddr_in sa;
		int fd = socket(AF_INET, SOCK_STREAM, 0), ok;

		if (fd < 0)
			return 0;
		memset(&sa, 0, sizeof sa);
		sa.sin_family = AF_INET;
		sa.sin_port = htons((unsigned short)port);
		sa.sin_addr.s_addr = htonl(INADDR_LOOPBACK);
		ok = connect(fd, (struct sockaddr *)&sa, sizeof sa) == 0;
		close(fd);
		if (ok)
			return 1;
		{
			struct timespec ts = {0, 100000000L};

			nanosleep(&ts, NULL);
		}
	}
	return 0;
}

/* A wrk duration "12.34ms" in ms. */
double
bench_wrk_ms(const char *s)
{
	char *end;
	double v = strtod(s, &end);

	if (strncmp(end, "us", 2) == 0)
		return v / 1e3;
	if (strncmp(end, "ms", 2) == 0)
		return v;
	if (*end == 's')
		return v * 1e3;
	if (*end == 'm')
		return v * 60e3;
	return v;
}

/* Peak resident memory of a process, MB (VmHWM), or NAN. */
double
bench_peak_rss_mb(pid_t pid)
{
	char path[64], line[256];
	FILE *f;
	double kb = NAN;

	snprintf(path, sizeof path, "/proc/%ld/status", (long)pid);
	if ((f = fopen(path, "r")) == NULL)
		return NAN;
	while (fgets(line, sizeof line, f) != NULL)
		if (strncmp(line, "VmHWM:", 6) == 0)
			kb = strtod(line + 6, NULL);
	fclose(f);
	return kb / 1024.0;
}
