#!/usr/bin/env bash
# Mutation run: applies each mutant of scripts/mutants.txt alone (one line of one header
# replaced), rebuilds and runs the test programs that include that header, and reports which
# mutants a test caught. The header is restored after every mutant and on any exit (trap).
# Format of scripts/mutants.txt and how to add mutants: DEVELOPERS.md, "Mutation run".
#
#   scripts/mutate.sh [-n] [-p] [-b BUILD_DIR] [-l LIST] [-o TABLE] [NAME_REGEX]
#
# -n only checks that every `from` line occurs exactly once (no build, nothing changed).
# -p tries only each mutant's `tests` programs (fast; "survived" then means survived those).
# BUILD_DIR (default build/test) must be configured and fully built once: the compiler's
# dependency files (*.o.d) tell which test programs include the touched header. A mutant is
# "caught" when a test program other than the golden-answer one (kernels_test_golden) fails;
# "survived" when all of them pass; "no-build" when the mutant does not compile (a bad
# mutant, not a catch); "not-found" when its `from` line is not in the file exactly once.
set -uo pipefail
cd "$(dirname "$0")/.."

build=build/test
list=scripts/mutants.txt
table=""
dry=0
preferred_only=0
while getopts "npb:l:o:" opt; do
  case $opt in
    p) preferred_only=1 ;;
    n) dry=1 ;;
    b) build=$OPTARG ;;
    l) list=$OPTARG ;;
    o) table=$OPTARG ;;
    *) echo "usage: $0 [-b BUILD_DIR] [-l LIST] [-o TABLE] [NAME_REGEX]" >&2; exit 2 ;;
  esac
done
shift $((OPTIND - 1))
only=${1:-}
golden=kernels_test_golden
nice_cmd=(nice -n 10)
jobs=${SPINWRIGHT_MUTATE_JOBS:-2}
per_test_timeout=${SPINWRIGHT_MUTATE_TIMEOUT:-300}

[ -f "$list" ] || { echo "no mutant list: $list" >&2; exit 2; }
[ "$dry" = 1 ] || [ -d "$build/tests" ] || { echo "$build is not a configured test build (cmake --preset test)" >&2; exit 2; }
log_dir=$(realpath -m "$build")/mutate  # absolute: the tests run from their own folder
mkdir -p "$log_dir"

backup=""
target_file=""
restore() {
  if [ -n "$backup" ] && [ -f "$backup" ]; then
    cp "$backup" "$target_file"  # plain cp: a new mtime, so the next build recompiles
    rm -f "$backup"
    backup=""
  fi
}
trap restore EXIT
trap 'restore; exit 130' INT TERM

# Test programs whose objects (or, for cli_test_cli, the spinwright program's objects) list
# the header among their dependencies.
dependents() {
  local header=$1 abs
  abs=$(realpath "$header")
  local found=()
  local d t
  while IFS= read -r d; do
    t=${d#"$build"/tests/CMakeFiles/}
    t=${t%%.dir/*}
    found+=("$t")
  done < <(grep -l -F "$abs" "$build"/tests/CMakeFiles/*_test_*.dir/*/*.o.d 2>/dev/null)
  # After a rebuild the Makefile generator may have folded the *.o.d into compiler_depend.make.
  while IFS= read -r d; do
    t=${d#"$build"/tests/CMakeFiles/}
    t=${t%%.dir/*}
    found+=("$t")
  done < <(grep -l -F "$abs" "$build"/tests/CMakeFiles/*_test_*.dir/compiler_depend.make 2>/dev/null)
  if [ -d "$build/examples/cli" ] && [ -d "$build/tests/CMakeFiles/cli_test_cli.dir" ] &&
    grep -q -l -F "$abs" "$build"/examples/cli/CMakeFiles/spinwright-cli.dir/*.o.d \
      "$build"/examples/cli/CMakeFiles/spinwright-cli.dir/compiler_depend.make 2>/dev/null; then
    found+=(cli_test_cli)
  fi
  # The MPI test program lives under tests/mpi and runs only under mpirun (through ctest).
  if grep -q -l -F "$abs" "$build"/tests/mpi/CMakeFiles/mpi_scale_out.dir/*.o.d \
    "$build"/tests/mpi/CMakeFiles/mpi_scale_out.dir/compiler_depend.make 2>/dev/null; then
    found+=(mpi_scale_out)
  fi
  printf '%s\n' "${found[@]}" | sort -u
}

# Runs one mutant in this shell (so the trap sees the backup); sets RESULT and DETAIL.
RESULT="" DETAIL=""
run_mutant() {
  local name=$1 file=$2 from=$3 to=$4 prefer=$5
  local stripped_from stripped_to count line indent
  stripped_from=$(sed -e 's/^[[:space:]]*//' -e 's/[[:space:]]*$//' <<<"$from")
  stripped_to=$(sed -e 's/^[[:space:]]*//' -e 's/[[:space:]]*$//' <<<"$to")
  [ -f "$file" ] || { RESULT=not-found DETAIL="no file $file"; return; }
  export MUTATE_FROM=$stripped_from MUTATE_TO=$stripped_to  # ENVIRON: no escape processing
  count=$(awk 'BEGIN { want = ENVIRON["MUTATE_FROM"] } { s = $0; sub(/^[ \t]+/, "", s); sub(/[ \t]+$/, "", s); if (s == want) n++ }
                                      END { print n + 0 }' "$file")
  if [ "$count" != 1 ]; then
    RESULT=not-found DETAIL="\`from\` matches $count lines of $file"
    return
  fi
  if [ "$dry" = 1 ]; then
    RESULT=found DETAIL="matches once"
    return
  fi
  target_file=$file
  backup=$(mktemp "$log_dir/backup.XXXXXX")
  cp "$file" "$backup"
  awk 'BEGIN { want = ENVIRON["MUTATE_FROM"]; repl = ENVIRON["MUTATE_TO"] } {
      s = $0; sub(/^[ \t]+/, "", s); sub(/[ \t]+$/, "", s)
      if (s == want) { match($0, /^[ \t]*/); print substr($0, 1, RLENGTH) repl } else print
    }' "$backup" >"$file"
  local deps=() t
  mapfile -t deps < <(dependents "$file")
  # Preferred targets (the mutant's `tests` line) first, then the other dependents; the golden
  # test last and only for the record.
  local order=() seen=" "
  for t in $prefer; do
    if printf '%s\n' "${deps[@]}" | grep -qx "$t"; then order+=("$t"); seen+="$t "; fi
  done
  for t in "${deps[@]}"; do
    [ "$preferred_only" = 1 ] && break
    [ "$t" = "$golden" ] && continue
    case $seen in *" $t "*) continue ;; esac
    order+=("$t")
  done
  if [ ${#order[@]} -eq 0 ]; then
    restore
    RESULT=survived DETAIL="no test program includes $file"
    return
  fi
  local result=survived detail="passed: ${#order[@]} programs" built_any=0
  for t in "${order[@]}"; do
    if ! "${nice_cmd[@]}" cmake --build "$build" --target "$t" -j"$jobs" >"$log_dir/$name.$t.build.log" 2>&1; then
      # A mutant that breaks compilation everywhere is a bad mutant; one that compiles in some
      # programs but not others still counts the ones that ran.
      continue
    fi
    built_any=1
    if [ "$t" = mpi_scale_out ]; then
      # Runs under mpirun with 1, 2 and 3 ranks: ctest holds the launcher and its flags.
      if ! timeout "$per_test_timeout" "${nice_cmd[@]}" ctest --test-dir "$build" -R '^mpi\.scale_out_np' \
        --output-on-failure >"$log_dir/$name.$t.log" 2>&1; then
        result=caught
        detail="by $t"
        break
      fi
      continue
    fi
    local exe
    exe=$(find "$build/tests" -maxdepth 1 -type f -name "$t" | head -1)
    [ -n "$exe" ] || continue
    if ! (cd "$build/tests" && timeout "$per_test_timeout" "${nice_cmd[@]}" "./$t" >"$log_dir/$name.$t.log" 2>&1); then
      result=caught
      detail="by $t"
      break
    fi
  done
  if [ $built_any = 0 ]; then
    result=no-build
    detail="see $log_dir/$name.*.build.log"
  fi
  restore
  RESULT=$result DETAIL=$detail
}

# Parse the list: records separated by blank lines; keys name/file/from/to/tests/note.
declare -a names files froms tos prefers
n=0
flush() {
  if [ -n "${cur_name:-}" ]; then
    names[n]=$cur_name files[n]=$cur_file froms[n]=$cur_from tos[n]=$cur_to prefers[n]=${cur_tests:-}
    n=$((n + 1))
  fi
  cur_name="" cur_file="" cur_from="" cur_to="" cur_tests=""
}
flush
while IFS= read -r raw || [ -n "$raw" ]; do
  case $raw in
    '#'*) continue ;;
    '') flush; continue ;;
  esac
  key=${raw%%:*}
  value=${raw#*:}
  value=${value# }
  case $key in
    name) cur_name=$value ;;
    file) cur_file=$value ;;
    from) cur_from=$value ;;
    to) cur_to=$value ;;
    tests) cur_tests=$value ;;
    note) ;;
    *) echo "$list: unknown key '$key' in: $raw" >&2; exit 2 ;;
  esac
done <"$list"
flush

rows=()
caught=0 survived=0 other=0
for ((k = 0; k < n; k++)); do
  name=${names[k]}
  if [ -n "$only" ] && ! [[ $name =~ $only ]]; then continue; fi
  start=$(date +%s)
  run_mutant "$name" "${files[k]}" "${froms[k]}" "${tos[k]}" "${prefers[k]}"
  status=$RESULT
  detail=$DETAIL
  case $status in
    caught | found) caught=$((caught + 1)) ;;
    survived) survived=$((survived + 1)) ;;
    *) other=$((other + 1)) ;;
  esac
  row=$(printf '| %s | %s | %s | %s | %ss |' "$name" "${files[k]#include/spinwright/}" "$status" "$detail" "$(($(date +%s) - start))")
  rows+=("$row")
  echo "$row"
done

{
  echo "| mutant | header | result | detail | time |"
  echo "| --- | --- | --- | --- | --- |"
  printf '%s\n' "${rows[@]}"
  echo
  echo "caught $caught, survived $survived, other $other (of $((caught + survived + other)))"
} >"$log_dir/table.md"
[ -n "$table" ] && cp "$log_dir/table.md" "$table"
echo
cat "$log_dir/table.md"
# The mutated programs are rebuilt from the restored headers by the next build.
[ "$survived" -eq 0 ] && [ "$other" -eq 0 ]
