/* SPDX-License-Identifier: BSD-3-Clause */
/* cmd_run.h: the run functions of the commands (daemon/cli/cmd_<name>.c)
   and their help made at run time, named in the command table
   (daemon/cli/cli_table.c). */
#ifndef MOONRANGE_CMD_RUN_H
#define MOONRANGE_CMD_RUN_H

#include <stdio.h>

#include "cli/cli.h"

/*
 * A run function gets the arguments the table has parsed and checked
 * (cli_args.c) and returns the exit status, having printed its output or
 * one error line.  Where one function serves two actions, a->cmd->mode
 * says which (the table's .mode).  A job (cli_store_job: target list,
 * blackout list, setting list and set) works on the database the table
 * has opened, ctx NULL.  The *_more functions print the help that
 * follows the options (.more).
 */
int cmd_ephem(const struct cli_args *a);
int cmd_phases(const struct cli_args *a);
int cmd_eclipses(const struct cli_args *a);
int cmd_windows(const struct cli_args *a);
void cmd_windows_more(FILE *f);
int cmd_tonight(const struct cli_args *a);
int cmd_plan(const struct cli_args *a);
int cmd_coverage(const struct cli_args *a);
int cmd_init(const struct cli_args *a);
void cmd_init_more(FILE *f);
/* station show; station set (mode 1). */
int cmd_station(const struct cli_args *a);
void cmd_station_more(FILE *f);
/* target set; target retire (mode 1); target add (mode 2). */
int cmd_target_write(const struct cli_args *a);
enum errcode cmd_target_list(struct cli_store *c, const struct cli_args *a,
    void *ctx, struct mbuf *out, char *err, size_t errlen);
int cmd_blackout_add(const struct cli_args *a);
enum errcode cmd_blackout_list(struct cli_store *c,
    const struct cli_args *a, void *ctx, struct mbuf *out, char *err,
    size_t errlen);
int cmd_blackout_remove(const struct cli_args *a);
enum errcode cmd_setting_list(struct cli_store *c,
    const struct cli_args *a, void *ctx, struct mbuf *out, char *err,
    size_t errlen);
enum errcode cmd_setting_set(struct cli_store *c, const struct cli_args *a,
    void *ctx, struct mbuf *out, char *err, size_t errlen);
void cmd_setting_more(FILE *f);
int cmd_log_add(const struct cli_args *a);
/* log list; log export (mode 1). */
int cmd_log_list(const struct cli_args *a);
int cmd_log_import(const struct cli_args *a);
void cmd_log_import_more(FILE *f);
int cmd_np_import(const struct cli_args *a);
int cmd_np_count(const struct cli_args *a);
/* eop status; eop import (mode 1). */
int cmd_eop(const struct cli_args *a);
int cmd_serve(const struct cli_args *a);
void cmd_serve_more(FILE *f);
int cmd_demo(const struct cli_args *a);
int cmd_bench(const struct cli_args *a);

#endif
