
# Consider dependencies only in project.
set(CMAKE_DEPENDS_IN_PROJECT_ONLY OFF)

# The set of languages for which implicit dependencies are needed:
set(CMAKE_DEPENDS_LANGUAGES
  )

# The set of dependency files which are needed:
set(CMAKE_DEPENDS_DEPENDENCY_FILES
  "/work/main/src/analysis/analysis.c" "CMakeFiles/schrot_core.dir/src/analysis/analysis.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/analysis/analysis.c.o.d"
  "/work/main/src/arrivals/arrivals.c" "CMakeFiles/schrot_core.dir/src/arrivals/arrivals.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/arrivals/arrivals.c.o.d"
  "/work/main/src/augment/augment.c" "CMakeFiles/schrot_core.dir/src/augment/augment.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/augment/augment.c.o.d"
  "/work/main/src/base/arena.c" "CMakeFiles/schrot_core.dir/src/base/arena.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/base/arena.c.o.d"
  "/work/main/src/base/buf.c" "CMakeFiles/schrot_core.dir/src/base/buf.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/base/buf.c.o.d"
  "/work/main/src/base/diag.c" "CMakeFiles/schrot_core.dir/src/base/diag.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/base/diag.c.o.d"
  "/work/main/src/base/err.c" "CMakeFiles/schrot_core.dir/src/base/err.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/base/err.c.o.d"
  "/work/main/src/base/outfile.c" "CMakeFiles/schrot_core.dir/src/base/outfile.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/base/outfile.c.o.d"
  "/work/main/src/base/pattern_pcre2.c" "CMakeFiles/schrot_core.dir/src/base/pattern_pcre2.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/base/pattern_pcre2.c.o.d"
  "/work/main/src/base/rng.c" "CMakeFiles/schrot_core.dir/src/base/rng.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/base/rng.c.o.d"
  "/work/main/src/base/si.c" "CMakeFiles/schrot_core.dir/src/base/si.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/base/si.c.o.d"
  "/work/main/src/base/strmap.c" "CMakeFiles/schrot_core.dir/src/base/strmap.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/base/strmap.c.o.d"
  "/work/main/src/carriers/carriers.c" "CMakeFiles/schrot_core.dir/src/carriers/carriers.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/carriers/carriers.c.o.d"
  "/work/main/src/cmd/arrivals.c" "CMakeFiles/schrot_core.dir/src/cmd/arrivals.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/cmd/arrivals.c.o.d"
  "/work/main/src/cmd/augment.c" "CMakeFiles/schrot_core.dir/src/cmd/augment.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/cmd/augment.c.o.d"
  "/work/main/src/cmd/carriers.c" "CMakeFiles/schrot_core.dir/src/cmd/carriers.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/cmd/carriers.c.o.d"
  "/work/main/src/cmd/cli.c" "CMakeFiles/schrot_core.dir/src/cmd/cli.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/cmd/cli.c.o.d"
  "/work/main/src/cmd/common.c" "CMakeFiles/schrot_core.dir/src/cmd/common.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/cmd/common.c.o.d"
  "/work/main/src/cmd/merge.c" "CMakeFiles/schrot_core.dir/src/cmd/merge.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/cmd/merge.c.o.d"
  "/work/main/src/cmd/report.c" "CMakeFiles/schrot_core.dir/src/cmd/report.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/cmd/report.c.o.d"
  "/work/main/src/cmd/sweep.c" "CMakeFiles/schrot_core.dir/src/cmd/sweep.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/cmd/sweep.c.o.d"
  "/work/main/src/deck/cards.c" "CMakeFiles/schrot_core.dir/src/deck/cards.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/deck/cards.c.o.d"
  "/work/main/src/deck/deck.c" "CMakeFiles/schrot_core.dir/src/deck/deck.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/deck/deck.c.o.d"
  "/work/main/src/deck/instances.c" "CMakeFiles/schrot_core.dir/src/deck/instances.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/deck/instances.c.o.d"
  "/work/main/src/report/arrivals.c" "CMakeFiles/schrot_core.dir/src/report/arrivals.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/report/arrivals.c.o.d"
  "/work/main/src/report/csv.c" "CMakeFiles/schrot_core.dir/src/report/csv.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/report/csv.c.o.d"
  "/work/main/src/report/depfile.c" "CMakeFiles/schrot_core.dir/src/report/depfile.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/report/depfile.c.o.d"
  "/work/main/src/report/html.c" "CMakeFiles/schrot_core.dir/src/report/html.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/report/html.c.o.d"
  "/work/main/src/report/json.c" "CMakeFiles/schrot_core.dir/src/report/json.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/report/json.c.o.d"
  "/work/main/src/report/plot.c" "CMakeFiles/schrot_core.dir/src/report/plot.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/report/plot.c.o.d"
  "/work/main/src/report/sweep.c" "CMakeFiles/schrot_core.dir/src/report/sweep.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/report/sweep.c.o.d"
  "/work/main/src/report/table.c" "CMakeFiles/schrot_core.dir/src/report/table.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/report/table.c.o.d"
  "/work/main/src/sim/sim_ngspice.c" "CMakeFiles/schrot_core.dir/src/sim/sim_ngspice.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/sim/sim_ngspice.c.o.d"
  "/work/main/src/spectra/physics.c" "CMakeFiles/schrot_core.dir/src/spectra/physics.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/spectra/physics.c.o.d"
  "/work/main/src/spectra/spectra.c" "CMakeFiles/schrot_core.dir/src/spectra/spectra.c.o" "gcc" "CMakeFiles/schrot_core.dir/src/spectra/spectra.c.o.d"
  )

# Targets to which this target links.
set(CMAKE_TARGET_LINKED_INFO_FILES
  )

# Fortran module output directory.
set(CMAKE_Fortran_TARGET_MODULE_DIR "")
