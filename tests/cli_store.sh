#!/usr/bin/env bash
# SPDX-License-Identifier: BSD-3-Clause
# cli_store.sh: black-box tests of the station database through the
# moonrange program and the sqlite3 shell, on real files in a temporary
# directory.
# Exercises: daemon/store/store.c, sql/, daemon/cli/cli_store.c, daemon/cli/cmd_init.c,
# daemon/cli/cmd_log.c, daemon/cli/cmd_np.c, daemon/cli/cmd_eop.c, daemon/cli/cmd_target.c,
# daemon/cli/cmd_station.c, daemon/cli/cmd_blackout.c, daemon/cli/cmd_ephem.c.
# Usage: cli_store.sh MOONRANGE_BINARY SOURCE_DIR
set -u
M=$(cd "$(dirname "$1")" && pwd)/$(basename "$1")
SRC=$(cd "$2" && pwd)
SITE=$SRC/sample-site
T=$(mktemp -d "${TMPDIR:-/tmp}/moonrange-cli-store.XXXXXX")
trap 'rm -rf "$T"' EXIT
# shellcheck source=tests/lib.sh
source "$(dirname "$0")/lib.sh"
PY=/usr/bin/python3
q() { sqlite3 "$1" "$2"; }

# expect_fail NAME STATUS PATTERN CMD...: CMD exits with STATUS and its
# stderr is one or more "moonrange: error: " lines, one matching PATTERN.
expect_fail() {
	local name=$1 want=$2 pat=$3 st
	shift 3
	"$@" >"$T/out" 2>"$T/err"
	st=$?
	if [ "$st" -ne "$want" ]; then
		bad "$name (exit $st, want $want)"; sed 's/^/#   /' "$T/err"
	elif ! grep -q -- "$pat" "$T/err"; then
		bad "$name (no '$pat' in stderr)"; sed 's/^/#   /' "$T/err"
	elif grep -v -q '^moonrange: error: ' "$T/err"; then
		bad "$name (stray stderr lines)"; sed 's/^/#   /' "$T/err"
	else
		ok "$name"
	fi
}

# --- init ------------------------------------------------------------------
DB=$T/demo.db
check "init loads the sample site" "'$M' init --db '$DB' --site '$SITE' >'$T/init.out'"
check "init summary names the station" "grep -q 'station KSTR' '$T/init.out'"
check "station row" "[ \"\$(q '$DB' 'SELECT count(*) FROM station')\" = 1 ]"
check "five targets" "[ \"\$(q '$DB' 'SELECT count(*) FROM targets')\" = 5 ]"
NATT=$(q "$DB" 'SELECT count(*) FROM attempts')
check "at least 300 attempts" "[ '$NATT' -ge 300 ]"
NNP=$(q "$DB" 'SELECT count(*) FROM normal_points')
check "normal points loaded" "[ '$NNP' -gt 0 ]"
check "EOP rows loaded" "[ \"\$(q '$DB' 'SELECT count(*) FROM eop')\" -gt 100 ]"
check "WAL journal" "[ \"\$(q '$DB' 'PRAGMA journal_mode')\" = wal ]"
check "schema version 8" "[ \"\$(q '$DB' 'PRAGMA user_version')\" = 8 ]"
check "every table STRICT" "[ \"\$(q '$DB' \"SELECT count(*) FROM pragma_table_list WHERE schema = 'main' AND name NOT LIKE 'sqlite%' AND strict = 0\")\" = 0 ]"
check "derived angles in range" "[ \"\$(q '$DB' 'SELECT count(*) FROM attempts WHERE synodic_deg < 0 OR synodic_deg >= 360 OR abs(target_el_deg) > 90')\" = 0 ]"
expect_fail "init refuses to overwrite" 2 "already exists" "$M" init --db "$DB" --site "$SITE"
check "init --force replaces" "'$M' init --db '$DB' --site '$SITE' --force >/dev/null"
check "init default site dir works" "(cd '$T' && '$M' init --db '$T/default.db' >/dev/null)"
expect_fail "init without --db" 2 "--db" "$M" init
expect_fail "init: missing site dir" 2 "not a directory" "$M" init --db "$T/x.db" --site "$T/none"

# A broken site: init stores nothing, errors name file, line and field.
mkdir -p "$T/badsite"
cp "$SITE"/station.ini "$SITE"/targets.csv "$SITE"/eop.finals "$T/badsite/"
sed '8s/,ranged,/,ranged,/; 8s/^\([A-Z]*\),[^,]*,/\1,2025-13-40T99:00:00Z,/' \
    "$SITE/attempts.csv" >"$T/badsite/attempts.csv"
expect_fail "init: bad attempt time names file:line and field" 2 \
    "attempts.csv:8: field 'start_utc'" "$M" init --db "$T/bad.db" --site "$T/badsite"
check "init: nothing stored after a bad file" "[ ! -e '$T/bad.db' ]"
check "init: no temporary file left" "! ls '$T'/bad.db.init-* >/dev/null 2>&1"

# --- every CHECK refuses a hand-written bad row ------------------------------
# Each line: what is broken|what SQLite must name|the statement.
H=$T/hand.db
"$M" init --db "$H" --site "$SITE" >/dev/null
ATT="target_id,start_utc,start_mjd,end_utc,end_mjd,shots,returns,normal_points,outcome,operator,seeing_arcsec,notes,synodic_deg,mean_elong_deg,target_el_deg,sun_el_target_deg"
GOOD="'HERON','2030-01-01T00:00:00.000Z',62502.0,'2030-01-01T00:10:00.000Z',62502.0069444444,100,5,1,'ranged','op',1.0,'',10,10,30,5"
while IFS='|' read -r name want sql; do
	[ -z "$name" ] && continue
	if sqlite3 "$H" "PRAGMA foreign_keys=ON; $sql" 2>"$T/err"; then
		bad "CHECK refuses: $name (accepted)"
	elif ! grep -q -- "$want" "$T/err"; then
		bad "CHECK refuses: $name (not for '$want': $(cat "$T/err"))"
	else
		ok "CHECK refuses: $name ($want)"
	fi
done <<EOF
attempt negative shots|shots|INSERT INTO attempts ($ATT) VALUES ('HERON','2030-01-01T00:00:00.000Z',62502.0,'2030-01-01T00:10:00.000Z',62502.0069444444,-1,5,1,'ranged','op',1.0,'',10,10,30,5)
attempt negative returns|returns|INSERT INTO attempts ($ATT) VALUES ('HERON','2030-01-01T00:00:00.000Z',62502.0,'2030-01-01T00:10:00.000Z',62502.0069444444,100,-5,1,'ranged','op',1.0,'',10,10,30,5)
attempt negative normal points|normal_points|INSERT INTO attempts ($ATT) VALUES ('HERON','2030-01-01T00:00:00.000Z',62502.0,'2030-01-01T00:10:00.000Z',62502.0069444444,100,5,-1,'ranged','op',1.0,'',10,10,30,5)
attempt end before start|end_mjd|INSERT INTO attempts ($ATT) VALUES ('HERON','2030-01-01T00:00:00.000Z',62502.0,'2029-12-31T23:50:00.000Z',62501.9930555556,100,5,1,'ranged','op',1.0,'',10,10,30,5)
attempt unknown outcome|outcome|INSERT INTO attempts ($ATT) VALUES ('HERON','2030-01-01T00:00:00.000Z',62502.0,'2030-01-01T00:10:00.000Z',62502.0069444444,100,5,1,'lucky','op',1.0,'',10,10,30,5)
attempt time without Z|start_utc|INSERT INTO attempts ($ATT) VALUES ('HERON','2030-01-01 00:00:00',62502.0,'2030-01-01T00:10:00.000Z',62502.0069444444,100,5,1,'ranged','op',1.0,'',10,10,30,5)
attempt impossible date|start_utc|INSERT INTO attempts ($ATT) VALUES ('HERON','2030-02-30T00:00:00.000Z',62562.0,'2030-03-02T00:10:00.000Z',62562.0069444444,100,5,1,'ranged','op',1.0,'',10,10,30,5)
attempt month 13|start_utc|INSERT INTO attempts ($ATT) VALUES ('HERON','2030-13-01T00:00:00.000Z',62502.0,'2030-01-01T00:10:00.000Z',62502.0069444444,100,5,1,'ranged','op',1.0,'',10,10,30,5)
attempt hour 25|start_utc|INSERT INTO attempts ($ATT) VALUES ('HERON','2030-01-01T25:00:00.000Z',62502.0,'2030-01-01T00:10:00.000Z',62502.0069444444,100,5,1,'ranged','op',1.0,'',10,10,30,5)
attempt second 60 not at 23:59|start_utc|INSERT INTO attempts ($ATT) VALUES ('HERON','2030-01-01T10:00:60.000Z',62502.0,'2030-01-01T00:10:00.000Z',62502.0069444444,100,5,1,'ranged','op',1.0,'',10,10,30,5)
attempt MJD not of its text|start_mjd|INSERT INTO attempts ($ATT) VALUES ('HERON','2030-01-01T00:00:00.000Z',62000.0,'2030-01-01T00:10:00.000Z',62502.0069444444,100,5,1,'ranged','op',1.0,'',10,10,30,5)
attempt unknown target|FOREIGN KEY|INSERT INTO attempts ($ATT) VALUES ('NOWHERE','2030-01-01T00:00:00.000Z',62502.0,'2030-01-01T00:10:00.000Z',62502.0069444444,100,5,1,'ranged','op',1.0,'',10,10,30,5)
attempt text in a count|cannot store TEXT|INSERT INTO attempts ($ATT) VALUES ('HERON','2030-01-01T00:00:00.000Z',62502.0,'2030-01-01T00:10:00.000Z',62502.0069444444,'many',5,1,'ranged','op',1.0,'',10,10,30,5)
attempt synodic 360|synodic_deg|INSERT INTO attempts ($ATT) VALUES ('HERON','2030-01-01T00:00:00.000Z',62502.0,'2030-01-01T00:10:00.000Z',62502.0069444444,100,5,1,'ranged','op',1.0,'',360,10,30,5)
attempt operator over 95 bytes|operator|INSERT INTO attempts ($ATT) VALUES ('HERON','2030-01-01T00:00:00.000Z',62502.0,'2030-01-01T00:10:00.000Z',62502.0069444444,100,5,1,'ranged',printf('%.96c','x'),1.0,'',10,10,30,5)
attempt duplicate start|UNIQUE|INSERT INTO attempts ($ATT) SELECT target_id,start_utc,start_mjd,end_utc,end_mjd,shots,returns,normal_points,outcome,operator,seeing_arcsec,notes,synodic_deg,mean_elong_deg,target_el_deg,sun_el_target_deg FROM attempts LIMIT 1
station second row|failed: id|INSERT INTO station SELECT 2,name,code,lat_deg,lon_deg,height_m,time_zone,min_el_deg,max_sun_el_deg,min_sun_sep_deg,pressure_hpa,temperature_c,humidity,wavelength_nm,zenith_tau,fire_rate_hz,pulse_energy_mj,aperture_m,transmit_eff,receive_eff,detector_qe,seeing_arcsec,jitter_ps FROM station
station latitude 91|lat_deg|UPDATE station SET lat_deg = 91
station latitude -90.5|lat_deg|UPDATE station SET lat_deg = -90.5
station humidity 2|humidity|UPDATE station SET humidity = 2
station negative fire rate|fire_rate_hz|UPDATE station SET fire_rate_hz = -1
station zero pulse energy|pulse_energy_mj|UPDATE station SET pulse_energy_mj = 0
station efficiency over 1|receive_eff|UPDATE station SET receive_eff = 1.5
station seeing 0|seeing_arcsec|UPDATE station SET seeing_arcsec = 0
target zero cubes|cube_count|UPDATE targets SET cube_count = 0
target normal latitude 91|normal_lat_deg|UPDATE targets SET normal_lat_deg = 91
attempt range not lunar|range_km|UPDATE attempts SET range_km = 1000
target latitude 95|lat_deg|INSERT INTO targets (id,name,lat_deg,lon_deg,strength) VALUES ('X1','x',95,0,1)
target zero strength|strength|INSERT INTO targets (id,name,lat_deg,lon_deg,strength) VALUES ('X1','x',0,0,0)
target bad id|failed: id|INSERT INTO targets (id,name,lat_deg,lon_deg,strength) VALUES ('X 1','x',0,0,1)
target dark_only 2|dark_only|INSERT INTO targets (id,name,lat_deg,lon_deg,strength,dark_only) VALUES ('X1','x',0,0,1,2)
target alias taken|UNIQUE constraint failed: targets.alias|INSERT INTO targets (id,name,alias,lat_deg,lon_deg,strength) VALUES ('X1','x','heron',0,0,1)
blackout end before start|end_mjd|INSERT INTO blackouts (start_utc,start_mjd,end_utc,end_mjd) VALUES ('2030-01-02T00:00:00.000Z',62503.0,'2030-01-01T00:00:00.000Z',62502.0)
normal point negative photons|photons|INSERT INTO normal_points (target_id,station_code,epoch_utc,epoch_mjd,tof_s,photons,synodic_deg,mean_elong_deg,sun_el_target_deg) VALUES ('HERON','KSTR','2030-01-01T00:00:00.000000Z',62502.0,2.5,-3,10,10,5)
normal point tof not lunar|tof_s|INSERT INTO normal_points (target_id,station_code,epoch_utc,epoch_mjd,tof_s,photons,synodic_deg,mean_elong_deg,sun_el_target_deg) VALUES ('HERON','KSTR','2030-01-01T00:00:00.000000Z',62502.0,0.1,3,10,10,5)
normal point duplicate|UNIQUE|INSERT INTO normal_points SELECT NULL,target_id,station_code,epoch_utc,epoch_mjd,tof_s,photons,rms_ps,synodic_deg,mean_elong_deg,target_el_deg,sun_el_target_deg FROM normal_points LIMIT 1
eop half day|datatype mismatch|INSERT INTO eop VALUES (62502.5,'2030-01-01',0.1,0.1,0.1)
eop dut1 over 1 s|dut1_s|INSERT INTO eop VALUES (70000,'2050-07-13',1.5,0.1,0.1)
eop date not of its MJD|date_utc|INSERT INTO eop VALUES (70000,'2050-07-14',0.1,0.1,0.1)
setting unknown key|failed: key|INSERT INTO settings VALUES ('colour','blue')
setting bins 3|failed: value|INSERT INTO settings VALUES ('coverage_bins','3')
setting scope word|failed: value|INSERT INTO settings VALUES ('coverage_scope','some')
EOF
# A leap second (TAI-UTC stepped to 37 s at the end of 2016-12-31, IERS
# Bulletin C 52) is a valid time.
check "a leap-second start is accepted" "sqlite3 '$H' \"PRAGMA foreign_keys=ON; INSERT INTO attempts ($ATT) VALUES ('HERON','2016-12-31T23:59:60.500Z',57753.99999,'2017-01-01T00:10:00.000Z',57754.0069444444,100,5,1,'ranged','op',1.0,'',10,10,30,5)\""
check "the good row is accepted" "sqlite3 '$H' \"PRAGMA foreign_keys=ON; INSERT INTO attempts ($ATT) VALUES ($GOOD)\""

# --- log add / list ----------------------------------------------------------
L=$T/log.db
"$M" init --db "$L" --site "$SITE" >/dev/null
N0=$(q "$L" 'SELECT count(*) FROM attempts')
check "log add stores the row" "'$M' log add --db '$L' --target HERON --start 2026-12-01T05:00:00Z --end 2026-12-01T05:20:00Z --shots 12000 --returns 44 --normal-points 2 --outcome ranged --operator 'op test' --seeing 1.2 --notes 'invented' --json >'$T/add.json'"
check "log add prints the stored row with derived angles" "$PY -c \"import json,sys; r=json.load(open('$T/add.json')); sys.exit(0 if r['target']=='HERON' and 0<=r['synodic_deg']<360 and r['start_utc']=='2026-12-01T05:00:00.000Z' else 1)\""
expect_fail "log add: same target and start" 2 "already has an attempt" "$M" log add --db "$L" --target HERON --start 2026-12-01T05:00:00Z --end 2026-12-01T05:20:00Z --shots 1 --returns 0 --normal-points 0 --outcome weather --operator op
expect_fail "log add: negative shots" 2 "--shots" "$M" log add --db "$L" --target HERON --start 2026-12-02T05:00:00Z --end 2026-12-02T05:20:00Z --shots -5 --returns 0 --normal-points 0 --outcome weather --operator op
expect_fail "log add: bad time" 2 "--start" "$M" log add --db "$L" --target HERON --start 2026-12-02T25:00:00Z --end 2026-12-02T05:20:00Z --shots 5 --returns 0 --normal-points 0 --outcome weather --operator op
expect_fail "log add: end before start" 2 "--end" "$M" log add --db "$L" --target HERON --start 2026-12-02T05:00:00Z --end 2026-12-02T04:20:00Z --shots 5 --returns 0 --normal-points 0 --outcome weather --operator op
expect_fail "log add: unknown target" 2 "no target 'NOWHERE'" "$M" log add --db "$L" --target NOWHERE --start 2026-12-02T05:00:00Z --end 2026-12-02T05:20:00Z --shots 5 --returns 0 --normal-points 0 --outcome weather --operator op
expect_fail "log add: unknown outcome" 2 "--outcome" "$M" log add --db "$L" --target HERON --start 2026-12-02T05:00:00Z --end 2026-12-02T05:20:00Z --shots 5 --returns 0 --normal-points 0 --outcome lucky --operator op
expect_fail "log add: missing options" 2 "required" "$M" log add --db "$L" --target HERON
# Text options must be UTF-8 (0xFF never occurs in UTF-8, RFC 3629), as in
# the files; nothing is stored.
NA=$(q "$L" 'SELECT count(*) FROM attempts')
expect_fail "log add: operator not UTF-8" 2 "--operator" "$M" log add --db "$L" --target HERON --start 2026-12-02T05:00:00Z --end 2026-12-02T05:20:00Z --shots 5 --returns 0 --normal-points 0 --outcome weather --operator $'op\xff'
expect_fail "log add: notes not UTF-8" 2 "--notes" "$M" log add --db "$L" --target HERON --start 2026-12-02T05:00:00Z --end 2026-12-02T05:20:00Z --shots 5 --returns 0 --normal-points 0 --outcome weather --operator op --notes $'two\nlines \xc0\xaf'
check "log add: nothing stored for bad text" "[ \"\$(q '$L' 'SELECT count(*) FROM attempts')\" = $NA ]"
expect_fail "target add: name not UTF-8" 2 "--name" "$M" target add --db "$L" BADTXT --name $'a\xffb' --lat 1 --lon 2
expect_fail "blackout add: reason not UTF-8" 2 "--reason" "$M" blackout add --db "$L" --start 2027-01-01T00:00:00Z --end 2027-01-02T00:00:00Z --reason $'\xed\xa0\x80'
expect_fail "station set: name not UTF-8" 2 "station.name" "$M" station set --db "$L" station.name=$'bad\xff'
expect_fail "station set: a zone this system does not know is refused" 2 "station.time_zone: 'Nowhere/Invented' is not a time zone" "$M" station set --db "$L" station.time_zone=Nowhere/Invented
check "... and the stored zone is kept" "[ \"\$(q '$L' 'SELECT time_zone FROM station')\" != Nowhere/Invented ]"
mkdir -p "$T/badzone"
cp "$SITE"/targets.csv "$T/badzone/"
sed 's#^time_zone = .*#time_zone = Nowhere/Invented#' "$SITE/station.ini" >"$T/badzone/station.ini"
expect_fail "init: a zone this system does not know is refused" 2 "station.ini: station.time_zone: 'Nowhere/Invented'" "$M" init --db "$T/badzone.db" --site "$T/badzone"
check "init: nothing stored for an unknown zone" "[ ! -e '$T/badzone.db' ]"
check "station set: a known zone gives no warning" "[ -z \"\$('$M' station set --db '$L' station.time_zone=America/Los_Angeles 2>&1 >/dev/null)\" ]"
check "target list --json still whole" "'$M' target list --db '$L' --json | $PY -c 'import json,sys; json.load(sys.stdin)'"
# A value a hand-written INSERT left unreadable as JSON: an error, not an
# empty document with exit 0.
cp "$L" "$T/badtext.db"
sqlite3 "$T/badtext.db" "UPDATE targets SET name = CAST(X'61FF62' AS TEXT) WHERE id = 'HERON'"
expect_fail "target list --json of a stored non-UTF-8 name fails" 1 "" "$M" target list --db "$T/badtext.db" --json
expect_fail "log list: missing database" 2 "does not exist" "$M" log list --db "$T/none.db"
check "log add/failures: one row more" "[ \"\$(q '$L' 'SELECT count(*) FROM attempts')\" = $((N0 + 1)) ]"
check "log list --since --target" "[ \"\$('$M' log list --db '$L' --since 2026-12-01T00:00:00Z --target HERON --json | $PY -c 'import json,sys; print(len(json.load(sys.stdin)[\"attempts\"]))')\" = 1 ]"
check "log list --csv has a header" "'$M' log list --db '$L' --csv | head -1 | grep -q '^id,target,start_utc'"
check "log list table" "'$M' log list --db '$L' --limit 5 | grep -q '5 attempts'"

# --- log import: bad input leaves the count unchanged -------------------------
HDR="target,start_utc,end_utc,shots,returns,normal_points,outcome,operator,seeing_arcsec,notes"
N1=$(q "$L" 'SELECT count(*) FROM attempts')
mk() { printf '%s\n' "$HDR" "HERON,2027-02-01T05:00:00Z,2027-02-01T05:10:00Z,100,3,1,ranged,op,,ok row" "$@" >"$T/in.csv"; }
mk "HERON,2027-02-01T06:00:00Z,2027-02-01T06:10:00Z,100,3,1,ranged,op"
expect_fail "import: wrong column count (line 3)" 2 "in.csv:3" "$M" log import --db "$L" "$T/in.csv"
mk "HERON,2027-02-01T06:00:00,2027-02-01T06:10:00Z,100,3,1,ranged,op,,x"
expect_fail "import: bad time (line 3, start_utc)" 2 "in.csv:3: field 'start_utc'" "$M" log import --db "$L" "$T/in.csv"
mk "NOWHERE,2027-02-01T06:00:00Z,2027-02-01T06:10:00Z,100,3,1,ranged,op,,x"
expect_fail "import: unknown target (line 3)" 2 "in.csv:3: field 'target'" "$M" log import --db "$L" "$T/in.csv"
mk "HERON,2027-02-01T06:00:00Z,2027-02-01T06:10:00Z,-100,3,1,ranged,op,,x"
expect_fail "import: negative count (line 3, shots)" 2 "in.csv:3: field 'shots'" "$M" log import --db "$L" "$T/in.csv"
mk "HERON,2027-02-01T06:00:00Z,2027-02-01T06:10:00Z,100,3,1,ranged,op,,caf$(printf '\351') latin-1"
expect_fail "import: non-UTF-8" 2 "UTF-8" "$M" log import --db "$L" "$T/in.csv"
mk 'HERON,2027-02-01T06:00:00Z,2027-02-01T06:10:00Z,100,3,1,ranged,op,,"unterminated'
expect_fail "import: truncated file (open quote)" 2 "in.csv" "$M" log import --db "$L" "$T/in.csv"
mk "HERON,2027-02-01T06:00:00Z,2027-02-01T06:10:00Z,100,3,1,ranged,op,,x" \
   "HERON,2027-02-01T07:00:00Z,2027-02-01T06:10:00Z,100,3,1,ranged,op,,end first" \
   "TERN,2027-02-01T08:00:00Z,2027-02-01T08:10:00Z,100,3,1,lucky,op,,bad outcome"
expect_fail "import: every bad row reported (line 4)" 2 "in.csv:4" "$M" log import --db "$L" "$T/in.csv"
check "import: ... and line 5 in the same run" "grep -q 'in.csv:5' '$T/err'"
expect_fail "import: missing file" 2 "cannot open" "$M" log import --db "$L" "$T/none.csv"
check "bad imports left the count unchanged" "[ \"\$(q '$L' 'SELECT count(*) FROM attempts')\" = $N1 ]"
mk "HERON,2027-02-01T06:00:00Z,2027-02-01T06:10:00Z,100,3,1,ranged,op,,x"
check "good import adds 2" "'$M' log import --db '$L' '$T/in.csv' | grep -q '2 added, 0 already'"
check "re-import skips 2" "'$M' log import --db '$L' '$T/in.csv' | grep -q '0 added, 2 already present'"

# --- round trip: export, import into a fresh database, identical rows --------
mkdir -p "$T/noattempts"
cp "$SITE"/station.ini "$SITE"/targets.csv "$SITE"/eop.finals "$T/noattempts/"
"$M" log export --db "$L" >"$T/export.csv"
"$M" init --db "$T/fresh.db" --site "$T/noattempts" >/dev/null
check "export imports into a fresh database" "'$M' log import --db '$T/fresh.db' '$T/export.csv' >/dev/null"
check "export of the copy is identical" "'$M' log export --db '$T/fresh.db' | cmp -s - '$T/export.csv'"
check "stored rows identical, derived angles too" "cmp -s <(q '$L' 'SELECT target_id,start_utc,start_mjd,end_utc,end_mjd,shots,returns,normal_points,outcome,operator,seeing_arcsec,notes,synodic_deg,mean_elong_deg,target_el_deg,sun_el_target_deg FROM attempts ORDER BY start_mjd,target_id') <(q '$T/fresh.db' 'SELECT target_id,start_utc,start_mjd,end_utc,end_mjd,shots,returns,normal_points,outcome,operator,seeing_arcsec,notes,synodic_deg,mean_elong_deg,target_el_deg,sun_el_target_deg FROM attempts ORDER BY start_mjd,target_id')"
check "export is CRLF-terminated (RFC 4180)" "[ \"\$(head -1 '$T/export.csv' | od -An -c | tr -d ' \n' | tail -c 4)\" = '\\r\\n' ]"

# --- normal points -------------------------------------------------------------
check "np import is idempotent" "'$M' np import --db '$L' '$SITE/normalpoints.crd' | grep -q ' 0 added, $NNP already present'"
check "np import per-target summary" "'$M' np import --db '$L' '$SITE/normalpoints.crd' | grep -q 'target HERON:'"
awk 'NR==12{print "11 garbage here"; next} {print}' "$SITE/normalpoints.crd" >"$T/bad.crd"
sqlite3 "$L" 'DELETE FROM normal_points'
expect_fail "np import: malformed line named" 2 "bad.crd:12" "$M" np import --db "$L" "$T/bad.crd"
check "np import: nothing stored from the bad file" "[ \"\$(q '$L' 'SELECT count(*) FROM normal_points')\" = 0 ]"
sed 's/^H3 heron /H3 nosuch /' "$SITE/normalpoints.crd" >"$T/alias.crd"
expect_fail "np import: unknown target name" 2 "nosuch" "$M" np import --db "$L" "$T/alias.crd"
sed 's/^H2 KSTR /H2 OTHR /' "$SITE/normalpoints.crd" >"$T/other.crd"
check "np import of another station's file" "'$M' np import --db '$L' '$T/other.crd' >/dev/null"
check "... keeps its station code, no elevation of ours" "[ \"\$(q '$L' \"SELECT count(*) FROM normal_points WHERE station_code = 'OTHR' AND target_el_deg IS NULL AND sun_el_target_deg IS NOT NULL\")\" = $NNP ]"
check "np count --station" "[ \"\$('$M' np count --db '$L' --station OTHR)\" = $NNP ]"
sqlite3 "$L" "DELETE FROM normal_points WHERE station_code = 'OTHR'"
check "np count" "[ \"\$('$M' np count --db '$L')\" = 0 ]"

# --- EOP -----------------------------------------------------------------------
C04=/usr/lib/python3/dist-packages/astropy/utils/iers/data/eopc04_IAU2000.62-now
if [ -r "$C04" ]; then
	check "eop import --c04 of the IERS C04 series (python3-astropy)" "'$M' eop import --db '$L' --c04 '$C04' >/dev/null 2>&1"
	# IERS rule: |UT1-UTC| < 0.9 s on every day.
	check "C04: |UT1-UTC| < 0.9 s every day" "[ \"\$(q '$L' 'SELECT count(*) FROM eop WHERE abs(dut1_s) >= 0.9')\" = 0 ]"
	# IERS/ERFA: every jump of UT1-UTC by about +1 s from one day to the
	# next falls on a day where ERFA's leap-second table steps by 1 s, and
	# every such step inside the series shows as a jump (pyerfa of
	# python3-astropy gives ERFA's table).
	q "$L" 'SELECT b.mjd FROM eop a JOIN eop b ON b.mjd = a.mjd + 1 WHERE b.dut1_s - a.dut1_s > 0.5' >"$T/jumps"
	q "$L" 'SELECT min(mjd), max(mjd) FROM eop' >"$T/span"
	check "C04: the +1 s jumps of UT1-UTC are ERFA's leap seconds" "$PY - '$T/jumps' '$T/span' <<'PYEOF'
import sys, erfa
jumps = {int(l) for l in open(sys.argv[1]) if l.strip()}
lo, hi = (int(x) for x in open(sys.argv[2]).read().split('|'))
def dat(mjd):
    y, m, d, f = erfa.jd2cal(2400000.5, float(mjd))
    return erfa.dat(y, m, d, 0.0)
steps = {mjd for mjd in range(max(lo + 1, 41318), hi + 1)
         if abs(dat(mjd) - dat(mjd - 1) - 1.0) < 1e-9}
sys.exit(0 if jumps and jumps == steps else 1)
PYEOF"
else
	echo "# skip: $C04 not installed"
fi
head -c 2000 "$SITE/eop.finals" >"$T/cut.finals"
NE=$(q "$L" 'SELECT count(*) FROM eop')
expect_fail "eop import: truncated finals file" 2 "cut.finals" "$M" eop import --db "$L" "$T/cut.finals"
expect_fail "log import of a directory is bad input" 2 "is a directory" "$M" log import --db "$L" "$T"
expect_fail "np import of a directory is bad input" 2 "is a directory" "$M" np import --db "$L" "$T"
check "eop import failure left the table" "[ \"\$(q '$L' 'SELECT count(*) FROM eop')\" = $NE ]"
check "ephem --db reports the EOP source" "'$M' ephem --db '$L' --at 2026-06-01T00:00:00Z --json | grep -q '\"dut1_source\": \"table\"'"
check "ephem --db: no table row gives none" "'$M' ephem --db '$L' --at 2035-06-01T00:00:00Z --json | grep -q '\"dut1_source\": \"none\"'"
check "ephem --db: JSON gives the table's last day" "'$M' ephem --db '$L' --at 2026-06-01T00:00:00Z --json | grep -q '\"eop_last_utc\": \"[0-9]\{4\}-[0-9][0-9]-[0-9][0-9]\"'"
check "ephem --db: text gives the DUT1 source and the table's last day" "'$M' ephem --db '$L' --at 2026-06-01T00:00:00Z | grep -q 'DUT1 .* (table; EOP table ends [0-9]\{4\}-[0-9][0-9]-[0-9][0-9])'"
check "ephem --db: text beyond the table says none" "'$M' ephem --db '$L' --at 2035-06-01T00:00:00Z | grep -q 'DUT1 +0.0000 s (none; EOP table ends'"
check "phases --db: local time in the station's zone beside UTC" "'$M' phases --db '$L' --from 2026-01-01T00:00:00Z --days 31 | grep -q '^New moon .*Z  2026-01-[0-9][0-9] [0-9][0-9]:[0-9][0-9] PST\$'"
check "ephem --db lists the active targets" "[ \"\$('$M' ephem --db '$L' --at 2026-06-01T00:00:00Z --json | $PY -c 'import json,sys; print(len(json.load(sys.stdin)[\"targets\"]))')\" = 5 ]"

# --- schema versions -----------------------------------------------------------
cp "$L" "$T/newer.db"
sqlite3 "$T/newer.db" 'PRAGMA user_version = 99'
expect_fail "a newer schema is refused" 1 "schema version 99" "$M" log list --db "$T/newer.db"
printf 'not a database at all\n' >"$T/text.db"
expect_fail "a text file is refused" 1 "not a readable SQLite database" "$M" log list --db "$T/text.db"
expect_fail "a newer schema is not called old when read" 1 "newer than this program knows" "$M" ephem --db "$T/newer.db"
# A WAL database in a directory its reader cannot write (as on a
# read-only file system): SQLite cannot make the -shm file, so a reader
# reads the file as immutable; a writer is refused naming the -shm file
# (needs an unprivileged user).
if [ "$(id -u)" = 0 ] && command -v setpriv >/dev/null; then
	mkdir "$T/rodir" && cp "$L" "$T/rodir/ro.db" && chmod 755 "$T" &&
	    chmod 555 "$T/rodir" && chmod 444 "$T/rodir/ro.db"
	check "read-only directory: log list reads every attempt" "[ \"\$(setpriv --reuid 65534 --regid 65534 --clear-groups '$M' log list --db '$T/rodir/ro.db' --json | $PY -c 'import json,sys; print(len(json.load(sys.stdin)["attempts"]))')\" = \"\$('$M' log list --db '$L' --json | $PY -c 'import json,sys; print(len(json.load(sys.stdin)["attempts"]))')\" ]"
	expect_fail "read-only directory: a writer names the -shm file" 1 "ro.db-shm" \
	    setpriv --reuid 65534 --regid 65534 --clear-groups "$M" target retire --db "$T/rodir/ro.db" HERON
	expect_fail "read-only directory: nothing written" 1 "ro.db" \
	    setpriv --reuid 65534 --regid 65534 --clear-groups "$M" log add --db "$T/rodir/ro.db" \
	    --target HERON --start 2025-01-01T00:00:00Z --end 2025-01-01T00:10:00Z \
	    --shots 1 --returns 0 --normal-points 0 --outcome weather --operator x
	chmod 755 "$T/rodir"
fi

# --- two writers at once ---------------------------------------------------------
C=$T/conc.db
"$M" init --db "$C" --site "$T/noattempts" >/dev/null
# Distinct starts: each writer shifts by its index (minutes).
writer() {
	local tgt=$1 i h m
	for i in $(seq 0 999); do
		h=$((i / 60)); m=$((i % 60))
		"$M" log add --db "$C" --target "$tgt" \
		    --start "$(printf '2027-01-%02dT%02d:%02d:00Z' $((1 + h / 24)) $((h % 24)) "$m")" \
		    --end "$(printf '2027-01-%02dT%02d:%02d:30Z' $((1 + h / 24)) $((h % 24)) "$m")" \
		    --shots "$((i % 600))" --returns 0 --normal-points 0 \
		    --outcome weather --operator "writer $tgt" >/dev/null 2>>"$T/conc.err" ||
		    echo "fail $i" >>"$T/conc.err"
	done
}
: >"$T/conc.err"
writer HERON & p1=$!
writer OSPREY & p2=$!
wait $p1 $p2
check "two concurrent writers: 2000 rows" "[ \"\$(q '$C' 'SELECT count(*) FROM attempts')\" = 2000 ]"
# (Warnings of attempts stored as suspicious, attempt.h, are no errors.)
check "two concurrent writers: no error shown" "! grep -qv '^moonrange: warning: ' '$T/conc.err'"
grep -v '^moonrange: warning: ' "$T/conc.err" | head -5 | sed 's/^/#   /'

# --- kill -9 during a large import -----------------------------------------------
K=$T/kill.db
"$M" init --db "$K" --site "$T/noattempts" >/dev/null
lib_big_attempts_csv "$T/big.csv" 2027 60000
"$M" log import --db "$K" "$T/big.csv" >/dev/null 2>"$T/kill.err" & kp=$!
# Let the import get under way (progress is shown on a terminal only, so
# there is no line to wait for here): until it has run 0.3 s of CPU (of
# about 1.2 s; /proc/PID/stat utime + stime in ticks of 10 ms), however
# loaded the machine, then kill.
for _ in $(seq 1 200); do
	[ -r "/proc/$kp/stat" ] || break
	ticks=$(awk '{print $14 + $15}' "/proc/$kp/stat" 2>/dev/null || echo 0)
	[ "${ticks:-0}" -ge 30 ] && break
	sleep 0.05
done
if kill -9 "$kp" 2>/dev/null; then
	wait "$kp" 2>/dev/null
	KN=$(q "$K" 'SELECT count(*) FROM attempts')
	check "kill -9 mid-import: all or none ($KN rows)" "[ '$KN' = 0 ] || [ '$KN' = 60000 ]"
	check "kill -9 mid-import: integrity_check ok" "[ \"\$(q '$K' 'PRAGMA integrity_check')\" = ok ]"
	check "after the kill a new import completes" "'$M' log import --db '$K' '$T/big.csv' 2>/dev/null | grep -q '60000 attempts read'"
	check "... with every row" "[ \"\$(q '$K' 'SELECT count(*) FROM attempts')\" = 60000 ]"
	# The log's statistics written by the import's transaction: current,
	# and their counts and returns those of the rows (usable: core/score.c).
	check "import: log statistics current" "[ \"\$(q '$K' 'SELECT stats_gen = log_gen FROM logstats_meta')\" = 1 ]"
	check "import: statistics count every attempt" "[ \"\$(q '$K' \"SELECT attempts FROM logstats WHERE target_id = ''\")\" = 60000 ]"
	check "import: per-target counts as the rows" "[ \"\$(q '$K' \"SELECT count(*) FROM logstats s WHERE target_id <> '' AND attempts <> (SELECT count(*) FROM attempts a WHERE a.target_id = s.target_id)\")\" = 0 ]"
	check "import: usable returns as the rows" "[ \"\$(q '$K' \"SELECT (SELECT dark_returns + lit_returns FROM logstats WHERE target_id = '') = (SELECT total(returns) FROM attempts WHERE suspect = 0 AND outcome IN ('ranged', 'no_returns') AND shots > 0 AND target_el_deg > 0)\")\" = 1 ]"
else
	bad "kill -9: the import ended before it could be killed"
fi

# --- site editing, --help everywhere ---------------------------------------------
check "target add" "'$M' target add --db '$L' EXTRA --name 'Extra (invented)' --lat 1 --lon 2 >/dev/null"
expect_fail "target add: latitude out of range" 2 "--lat" "$M" target add --db "$L" EXTRA2 --name x --lat 91 --lon 2
check "target retire" "'$M' target retire --db '$L' EXTRA >/dev/null && [ \"\$(q '$L' \"SELECT active FROM targets WHERE id = 'EXTRA'\")\" = 0 ]"
check "target list hides retired" "! '$M' target list --db '$L' | grep -q EXTRA"
check "station set" "'$M' station set --db '$L' limits.min_elevation_deg=25 >/dev/null && [ \"\$(q '$L' 'SELECT min_el_deg FROM station')\" = 25.0 ]"
expect_fail "station set: unknown key" 2 "unknown station key" "$M" station set --db "$L" limits.nope=1
check "blackout add/list" "'$M' blackout add --db '$L' --start 2027-01-01T00:00:00Z --end 2027-01-02T00:00:00Z --reason 'invented' >/dev/null && '$M' blackout list --db '$L' --json | grep -q invented"
check "setting set and list" "'$M' setting set --db '$L' coverage_bins 24 && '$M' setting list --db '$L' | grep -q 'coverage_bins *24'"
expect_fail "setting set: out of range" 2 "coverage_bins" "$M" setting set --db "$L" coverage_bins 2
for c in log np eop target station blackout setting; do
	expect_fail "$c without an action" 2 "an action is required" "$M" "$c"
done
expect_fail "unknown action" 2 "unknown action 'frobnicate'" "$M" log frobnicate
for c in init "log add" "log list" "log import" "log export" "np import" "eop import" \
    "target add" "target list" "station show" "station set" "blackout add" \
    "setting list" ephem; do
	# shellcheck disable=SC2086
	check "$c --help" "'$M' $c --help | grep -q usage"
done

echo "1..$n"
[ "$fails" -eq 0 ]
