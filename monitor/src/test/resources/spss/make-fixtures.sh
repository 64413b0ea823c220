#!/bin/sh
# Regenerates every SPSS fixture of this folder into OUTPUT_FOLDER (default: this folder) and what the independent
# tools read back from each file:
#   FILE.haven.tsv  R 4.2.2 with haven 2.5.1, read_sav(FILE, user_na = TRUE) (readback.R)
#   FILE.pspp.csv   GNU PSPP 1.6.2, DISPLAY DICTIONARY (measurement levels, missing values)
# pspp-longmiss.sav has no .haven.tsv: haven 2.5.1 refuses files with long string missing values.
set -eu
here=$(cd "$(dirname "$0")" && pwd)
out=$(cd "${1:-$here}" && pwd)
Rscript "$here/write-haven.R" "$out"
sh "$here/write-pspp.sh" "$out"
for f in haven-none.sav haven-byte.sav haven.zsav pspp-none.sav pspp-byte.sav pspp.zsav pspp-longmiss.sav pspp-latin1.sav; do
  if [ "$f" != pspp-longmiss.sav ]; then
    Rscript "$here/readback.R" "$out/$f" "$out/$f.haven.tsv"
  fi
  printf "GET FILE='%s'.\nDISPLAY DICTIONARY.\n" "$out/$f" > "$out/dictionary.sps"
  pspp -O format=csv -o "$out/dictionary.csv" "$out/dictionary.sps" >/dev/null 2>&1
  # PSPP's warnings name the folder the file was read from: only the tables are kept.
  grep -v '^warning: ' "$out/dictionary.csv" > "$out/$f.pspp.csv"
  rm -f "$out/dictionary.sps" "$out/dictionary.csv"
done
