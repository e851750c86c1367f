/* SPDX-License-Identifier: BSD-3-Clause */
/* bench_net.h: process and loopback helpers of "moonrange bench". */
#ifndef MOONRANGE_BENCH_NET_H
#define MOONRANGE_BENCH_NET_H

#include <sys/types.h>

/* A free loopback TCP port, or 0. */
int bench_free_port(void);

/* 1 once something accepts on the loopback port (polled for 120 s),
   else 0. */
int bench_wait_port(int port);

/* A wrk duration such as "12.34ms", "850.00us" or "1.20s", in ms. */
double bench_wrk_ms(const char *s);

/* Peak resident memory of a process in MB (VmHWM of /proc), or NAN. */
double bench_peak_rss_mb(pid_t pid);

#endif
