#!/bin/sh
# count.sh prints the instructions per operation of one Go benchmark, counted
# by valgrind's callgrind tool: the benchmark is run twice, for LOW and for
# HIGH iterations (-test.benchtime LOWx and HIGHx, by default 1000 and 3000),
# and the difference of the two programs' instruction totals is divided by
# HIGH - LOW, so the setup, the start of the test binary and the benchmark's
# first, one-iteration run cancel out. Unlike a time, the count does not
# change with the load of a shared machine.
#
# Usage, from the module root:
#
#     internal/benchcount/count.sh PACKAGE BENCHMARK [LOW HIGH]
#
#     internal/benchcount/count.sh ./eos/ 'Flash10/two-phase-0.9dew$'
#     internal/benchcount/count.sh ./cvd/ 'Deplete10$' 5 15
#
# PACKAGE is a package path for `go test -c`; BENCHMARK is the -test.bench
# pattern without the leading "Benchmark" (it is added, anchored) and must
# select exactly one benchmark: end it with $ so that a longer name does not
# match too. A slow benchmark (a millisecond or more per operation) wants
# smaller LOW and HIGH, as in the second example; callgrind runs the program
# about 50 times slower than it runs natively.
#
# Needs go, valgrind and callgrind_annotate (Debian: apt-get install
# valgrind). The runs use GOMAXPROCS=1 and GODEBUG=asyncpreemptoff=1, so the
# count is that of one thread without the runtime's preemption signals.
# This is a measuring tool for people; the test suite and CI do not run it.
set -eu

usage() {
	echo "usage: $0 PACKAGE BENCHMARK [LOW HIGH]   (e.g. $0 ./eos/ 'Flash10/two-phase-0.9dew\$')" >&2
	exit 2
}

[ $# -eq 2 ] || [ $# -eq 4 ] || usage
pkg=$1
bench=$2
low=${3:-1000}
high=${4:-3000}
case $low$high in
*[!0-9]*)
	echo "$0: LOW and HIGH must be whole numbers of iterations, got '$low' and '$high'" >&2
	exit 2
	;;
esac
if [ "$low" -lt 1 ] || [ "$high" -le "$low" ]; then
	echo "$0: want 1 <= LOW < HIGH, got LOW=$low HIGH=$high" >&2
	exit 2
fi
for tool in go valgrind callgrind_annotate; do
	command -v "$tool" >/dev/null 2>&1 || {
		echo "$0: $tool not found on PATH (valgrind and callgrind_annotate: apt-get install valgrind)" >&2
		exit 1
	}
done

dir=$(mktemp -d)
trap 'rm -rf "$dir"' EXIT INT TERM

go test -c -o "$dir/bench.test" "$pkg"
[ -x "$dir/bench.test" ] || {
	echo "$0: package $pkg has no test files to build a test binary from" >&2
	exit 1
}

# total N runs the benchmark for N iterations under callgrind and prints the
# program's instruction total.
total() {
	# in the package's directory, as go test runs it: benchmarks read
	# files by paths relative to it
	(cd "$pkg" && GODEBUG=asyncpreemptoff=1 GOMAXPROCS=1 valgrind --tool=callgrind \
		--callgrind-out-file="$dir/cg.$1" "$dir/bench.test" \
		-test.run '^$' -test.bench "^Benchmark$bench" -test.benchtime "${1}x" \
		>"$dir/out.$1" 2>"$dir/valgrind.$1") || {
		echo "$0: the benchmark failed under valgrind ($1 iterations):" >&2
		cat "$dir/out.$1" >&2
		tail -n 20 "$dir/valgrind.$1" >&2
		exit 1
	}
	runs=$(grep -c ' ns/op' "$dir/out.$1" || true)
	if [ "$runs" -ne 1 ]; then
		echo "$0: pattern '$bench' ran $runs benchmarks in $pkg, want exactly 1 (anchor it with \$; list them with go test -run '^\$' -bench . -benchtime 1x $pkg):" >&2
		grep ' ns/op' "$dir/out.$1" >&2 || true
		exit 1
	fi
	callgrind_annotate "$dir/cg.$1" 2>/dev/null | awk '/PROGRAM TOTALS/ { gsub(",", "", $1); print $1; exit }'
}

i1=$(total "$low")
i2=$(total "$high")
if [ -z "$i1" ] || [ -z "$i2" ]; then
	echo "$0: no PROGRAM TOTALS line in the callgrind_annotate output" >&2
	exit 1
fi
name=$(awk '/ ns\/op/ { print $1; exit }' "$dir/out.$high")
awk -v n="$name" -v a="$i1" -v b="$i2" -v l="$low" -v h="$high" 'BEGIN {
	printf "%s\t%.0f instructions/op\t(I%d = %.0f, I%d = %.0f)\n", n, (b - a) / (h - l), h, b, l, a
}'
