# Sourced by the bench scripts (not run on its own): the one summary of repeated runs, so that
# every script reports the same median. Values are plain numbers, one per argument.
#   median V...                  the median (the mean of the two middle values for an even count)
#   min_med_max FORMAT V...      "min A / median B / max C", each number printed with FORMAT
#   min_med_max_s V...           "min A s, median B s, max C s" (two decimals), for run times

median() {
  printf '%s\n' "$@" | sort -g | awk '{ v[NR] = $1 } END { print (NR % 2 ? v[(NR + 1) / 2] : (v[NR / 2] + v[NR / 2 + 1]) / 2) }'
}

min_med_max() {
  local fmt="$1"; shift
  printf '%s\n' "$@" | sort -g | awk -v f="$fmt" '{ v[NR] = $1 }
    END { m = NR % 2 ? v[(NR + 1) / 2] : (v[NR / 2] + v[NR / 2 + 1]) / 2
          printf "min " f " / median " f " / max " f, v[1], m, v[NR] }'
}

min_med_max_s() {
  printf '%s\n' "$@" | sort -g | awk '{ v[NR] = $1 }
    END { m = NR % 2 ? v[(NR + 1) / 2] : (v[NR / 2] + v[NR / 2 + 1]) / 2
          printf "min %.2f s, median %.2f s, max %.2f s", v[1], m, v[NR] }'
}
