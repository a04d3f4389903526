#!/usr/bin/env bash
# Mutation testing on demand (not in CI): small deliberate bugs ("mutants") in the physics, the
# rules and the parsers, each applied alone to a copy of the tree, built through ccache and run
# against the test suite. A mutant the suite catches is "killed"; one it lets through
# "SURVIVED" (a blind spot: add a test); one whose line no longer reads as written "not
# applicable" (the code moved on: update or drop the mutant).
#
#   scripts/mutants.sh [NAME...]     build and test all mutants, or only those named
#   scripts/mutants.sh --list        name, file and whether its text is found once (no build)
#
# Environment: SORTIE_MUTANT_DIR (the copy and its build; default build-mutants/ in the
# repository, ignored by git), SORTIE_MUTANT_JOBS (build and ctest jobs, default 2),
# SORTIE_MUTANT_TIMEOUT (seconds per test case, default 120). The open-data cases run when the
# data are found as the tests find them (SORTIE_OPEN_DATA, else ../shared/data beside this
# repository). Exit status 1 when a mutant survived or the unmutated copy fails its tests.
set -euo pipefail

repo=$(cd "$(dirname "$0")/.." && pwd)
work=${SORTIE_MUTANT_DIR:-$repo/build-mutants}
jobs=${SORTIE_MUTANT_JOBS:-2}
timeout_s=${SORTIE_MUTANT_TIMEOUT:-120}

names=() files=() froms=() tos=()
# mutant NAME FILE FROM TO: replace the one line-local text FROM by TO in FILE (literal text).
mutant() { names+=("$1"); files+=("$2"); froms+=("$3"); tos+=("$4"); }

# --- battery: Thevenin pack model -------------------------------------------------------------
mutant rc_r_without_temperature src/battery/thevenin.cpp \
  'p.cell.rc[k].r_ohm.scaled(sp * rf)' 'p.cell.rc[k].r_ohm.scaled(sp)'
mutant r0_without_soh src/battery/thevenin.cpp \
  'p.cell.r0_ohm.scaled(sp * p.soh_resistance * rf)' 'p.cell.r0_ohm.scaled(sp * rf)'
mutant wiring_sign src/battery/thevenin.cpp \
  'for (double& v : y) v += p.wiring_ohm;' 'for (double& v : y) v -= p.wiring_ohm;'
mutant terminal_unstable_root src/battery/thevenin.cpp \
  'out.current_A = 2.0 * C / (B + std::sqrt(disc));' 'out.current_A = 2.0 * C / (B - std::sqrt(disc));'
mutant rc_decay_sign src/battery/thevenin.cpp \
  'dxdt[idx] = (-x[idx] + i * r) / tau;' 'dxdt[idx] = (x[idx] + i * r) / tau;'
mutant soc_rate_sign src/battery/thevenin.cpp \
  'dxdt[kSoc] = -i / pack.capacity_C;' 'dxdt[kSoc] = i / pack.capacity_C;'
mutant emf_without_v2 src/battery/thevenin.cpp \
  'solve_terminal(ocv - x[kV1] - x[kV2], r0, ocv, demand, t);' 'solve_terminal(ocv - x[kV1], r0, ocv, demand, t);'
mutant energy_without_voltage src/battery/thevenin.cpp \
  'dxdt[kEnergy] = term.power_W;' 'dxdt[kEnergy] = term.current_A;'
mutant rc_heat_times_r src/battery/thevenin.cpp \
  'heat += x[idx] * x[idx] / r;' 'heat += x[idx] * x[idx] * r;'
mutant capacity_cell_only src/battery/thevenin.cpp \
  'capacity_C(3600.0 * p.capacity_Ah()),' 'capacity_C(3600.0 * p.cell.capacity_Ah),'

# --- core: tables ------------------------------------------------------------------------------
mutant table_end_off_by_one src/core/table.cpp \
  'if (x >= x_.back()) return y_.back();' 'if (x >= x_.back()) return y_[y_.size() - 2];'
mutant table_weight_reversed src/core/table.cpp \
  'const double w = (x - x_[i]) / (x_[i + 1] - x_[i]);' 'const double w = (x_[i + 1] - x) / (x_[i + 1] - x_[i]);'
mutant table_scaled_divides src/core/table.cpp \
  'for (double& v : t.y_) v *= k;' 'for (double& v : t.y_) v /= k;'

# --- propulsion --------------------------------------------------------------------------------
mutant thrust_d3 src/propulsion/propeller.cpp \
  'return p.ct(J) * rho_kg_m3 * n_rps * n_rps * D2 * D2;' 'return p.ct(J) * rho_kg_m3 * n_rps * n_rps * D2 * p.diameter_m;'
mutant power_n2 src/propulsion/propeller.cpp \
  'n_rps * n_rps * n_rps * D2 * D2 * p.diameter_m' 'n_rps * n_rps * D2 * D2 * p.diameter_m'
mutant ideal_power_no_inflow src/propulsion/propeller.cpp \
  'return thrust_N * (h + std::sqrt(h * h + vh2));' 'return thrust_N * std::sqrt(h * h + vh2);'
mutant esc_switch_without_bus_v src/propulsion/esc.cpp \
  'e.k_switch * v_bus_V * i_motor_A' 'e.k_switch * i_motor_A'
mutant esc_conduction_sign src/propulsion/esc.cpp \
  'e.p_idle_W + e.r_on_ohm * i_motor_A * i_motor_A' 'e.p_idle_W - e.r_on_ohm * i_motor_A * i_motor_A'
mutant motor_rm_sign src/propulsion/motor.cpp \
  'in.v_V = omega_rad_s / kv + in.i_A * m.rm_ohm;' 'in.v_V = omega_rad_s / kv - in.i_A * m.rm_ohm;'
mutant motor_without_i0 src/propulsion/motor.cpp \
  'in.i_A = torque_Nm * kv + m.i0_at(omega_rad_s);' 'in.i_A = torque_Nm * kv;'
mutant kv_without_2pi src/propulsion/motor.cpp \
  'kv_rpm_per_V * 2.0 * std::numbers::pi / 60.0' 'kv_rpm_per_V * std::numbers::pi / 60.0'

# --- flight ------------------------------------------------------------------------------------
mutant isa_lapse_sign src/flight/atmosphere.cpp \
  'return kSeaLevelTemperature - kLapseRate * h_m;' 'return kSeaLevelTemperature + kLapseRate * h_m;'
mutant density_ignores_offset src/flight/atmosphere.cpp \
  'p / (kGasConstantAir * t)}' 'p / (kGasConstantAir * t_isa)}'
mutant headwind_sign src/flight/wind.cpp \
  'const double gs = airspeed_mps * std::cos(beta) - c.head_mps;' 'const double gs = airspeed_mps * std::cos(beta) + c.head_mps;'
mutant min_power_speed_without_3 src/flight/fixed_wing.cpp \
  's.min_power_mps = v_ref * std::pow(K / (3.0 * cd0), 0.25);' 's.min_power_mps = v_ref * std::pow(K / cd0, 0.25);'
mutant induced_drag_cl_linear src/flight/fixed_wing.cpp \
  'd.cd = wing.cd0 + induced_drag_factor(wing) * d.cl * d.cl;' 'd.cd = wing.cd0 + induced_drag_factor(wing) * d.cl;'
mutant all_up_without_payload src/flight/airframe.cpp \
  'f.mass_empty_kg + f.payload_kg + pack_mass_kg' 'f.mass_empty_kg + pack_mass_kg'

# --- sim: mission, rules, spare ----------------------------------------------------------------
mutant rule_met_exactly_fails src/sim/mission_rules.cpp \
  'r.pass = act >= req;' 'r.pass = act > req;'
mutant limit_met_exactly_fails src/sim/mission_rules.cpp \
  'r.pass = act <= lim;' 'r.pass = act < lim;'
mutant reserve_floor_min src/sim/mission_rules.cpp \
  'std::max(f.cutoff, m.reserve.v_load_cell_min_V.value_or(0.0))' 'std::min(f.cutoff, m.reserve.v_load_cell_min_V.value_or(0.0))'
mutant cutoff_on_ocv src/sim/mission_phase.cpp \
  'return x.term.v_terminal_V / S - cutoff_cell_V; }' 'return x.term.v_ocv_V / S - cutoff_cell_V; }'
mutant saturation_without_duty_max src/sim/mission_phase.cpp \
  'return vm > 0 ? d_max * x.term.v_terminal_V - vm : 1.0;' 'return vm > 0 ? x.term.v_terminal_V - vm : 1.0;'
mutant demand_without_avionics src/sim/mission_phase.cpp \
  'battery::Demand::power(N * bl.a_W + m.avionics_W, N * bl.b_W_per_V)' 'battery::Demand::power(N * bl.a_W, N * bl.b_W_per_V)'
mutant stored_energy_without_half src/sim/mission.cpp \
  'integral += 0.5 * (prev_v + v) * (x - prev_x);' 'integral += (prev_v + v) * (x - prev_x);'
mutant spare_margin_sign src/sim/spare.cpp \
  'consider(rule.margin / scale, rule.name);' 'consider(-rule.margin / scale, rule.name);'

# --- io: parsers -------------------------------------------------------------------------------
mutant range_open_low_bound_closed src/core/range.cpp \
  'if (lo_open ? !(v > lo) : !(v >= lo)) return false;' 'if (lo_open ? !(v >= lo) : !(v >= lo)) return false;'
mutant range_closed_high_bound_open src/core/range.cpp \
  'if (hi_open ? !(v < hi) : !(v <= hi)) return false;' 'if (hi_open ? !(v < hi) : !(v < hi)) return false;'
mutant json_table_x_not_strict src/io/json_reader.cpp \
  'if (!(v[i] > v[i - 1]))' 'if (!(v[i] >= v[i - 1]))'
mutant bench_grams_without_g0 src/io/bench_csv.cpp \
  '{{"g", "gf"}, 9.80665e-3, "g"},' '{{"g", "gf"}, 1e-3, "g"},'
mutant log_milliamps_as_amps src/io/log_columns.cpp \
  'if (u == "ma") return UnitFactor{1e-3, 0.0, "A"};' 'if (u == "ma") return UnitFactor{1.0, 0.0, "A"};'
mutant log_milliseconds_as_seconds src/io/log_columns.cpp \
  'if (u == "ms") return UnitFactor{1e-3, 0.0, "s"};' 'if (u == "ms") return UnitFactor{1.0, 0.0, "s"};'

if [[ ${1:-} == --list ]]; then
  for i in "${!names[@]}"; do
    count=$(grep -cF -- "${froms[$i]}" "$repo/${files[$i]}" 2>/dev/null || true)
    printf '%-30s %-28s %s\n' "${names[$i]}" "${files[$i]}" "$([[ $count == 1 ]] && echo applicable || echo "not applicable ($count matches)")"
  done
  exit 0
fi
selected=("$@")
wanted() {
  [[ ${#selected[@]} -eq 0 ]] && return 0
  local s
  for s in "${selected[@]}"; do [[ $s == "$1" ]] && return 0; done
  return 1
}
for s in "${selected[@]}"; do
  found=0
  for n in "${names[@]}"; do [[ $n == "$s" ]] && found=1; done
  [[ $found == 1 ]] || { echo "mutants.sh: no mutant named '$s' (--list shows them)" >&2; exit 2; }
done

# The open data as the tests would find them from this repository.
if [[ -z ${SORTIE_OPEN_DATA:-} && -d $repo/../shared/data ]]; then
  export SORTIE_OPEN_DATA=$(cd "$repo/../shared/data" && pwd)
fi

# A copy of the tree as it is now (tracked and new files, without ignored ones such as build/).
tree=$work/tree
rm -rf "$tree"
mkdir -p "$tree"
(cd "$repo" && git ls-files -z --cached --others --exclude-standard | tar --null -T - -cf -) | tar -C "$tree" -xf -
log=$work/log
mkdir -p "$log"
cmake -S "$tree" -B "$tree/build" -DCMAKE_BUILD_TYPE=Release -DSORTIE_BUILD_TESTS=ON \
  -DSORTIE_BUILD_BENCH=OFF -DCMAKE_CXX_COMPILER_LAUNCHER=ccache >"$log/configure.txt" 2>&1

build() { cmake --build "$tree/build" -j"$jobs" --target sortie sortie_tests >"$1" 2>&1; }
# The suite without the headless-browser cases (slow, and they only look at a page); stop at the
# first failure: one failing case kills the mutant.
run_tests() {
  ctest --test-dir "$tree/build" -j"$jobs" -LE browser --timeout "$timeout_s" --stop-on-failure >"$1" 2>&1
}

echo "mutants.sh: building and testing the unmutated copy in $tree"
if ! build "$log/baseline-build.txt" || ! run_tests "$log/baseline-test.txt"; then
  echo "mutants.sh: the unmutated copy does not build or pass its tests (see $log/baseline-*.txt)" >&2
  exit 1
fi

report=$work/report.txt
printf '%-30s %-28s %-15s %s\n' mutant file result "first failing test" | tee "$report"
survived=0
for i in "${!names[@]}"; do
  name=${names[$i]} file=${files[$i]}
  wanted "$name" || continue
  target=$tree/$file
  count=$(grep -cF -- "${froms[$i]}" "$target" || true)
  if [[ $count != 1 ]]; then
    result="not applicable" detail="the text occurs $count times in $file"
  else
    cp "$target" "$work/original"
    FROM=${froms[$i]} TO=${tos[$i]} perl -0pi -e 's/\Q$ENV{FROM}\E/$ENV{TO}/' "$target"
    if ! build "$log/$name-build.txt"; then
      result="does not build" detail="$log/$name-build.txt"
    elif run_tests "$log/$name-test.txt"; then
      result="SURVIVED" detail=""
      survived=$((survived + 1))
    else
      result="killed"
      detail=$(grep -m1 -E '\*\*\*(Failed|Timeout|Exception)' "$log/$name-test.txt" |
        sed -E 's/^ *[0-9]+\/[0-9]+ Test +#[0-9]+: //; s/ \.+\*\*\*/ ***/' || true)
    fi
    cp "$work/original" "$target"
  fi
  printf '%-30s %-28s %-15s %s\n' "$name" "$file" "$result" "$detail" | tee -a "$report"
done
# Leave the copy built as it was.
build "$log/restore-build.txt" || true
echo "mutants.sh: report in $report; $survived survived"
[[ $survived == 0 ]]
