#!/bin/sh
# Writes the PSPP round-trip fixtures with GNU PSPP 1.6.2 (Debian pspp): pspp-none.sav (uncompressed),
# pspp-byte.sav (bytecode-compressed), pspp.zsav (zlib-compressed), pspp-longmiss.sav (the same with missing values
# on a long string, which haven 2.5.1 cannot read) and pspp-latin1.sav (a windows-1252 dictionary).
# Usage: sh write-pspp.sh OUTPUT_FOLDER
set -eu
here=$(cd "$(dirname "$0")" && pwd)
out=$(cd "$1" && pwd)
syntax="$out/write-pspp-run.sps"
{
  cat "$here/pspp-data.sps"
  echo "SAVE OUTFILE='$out/pspp-none.sav' /UNCOMPRESSED."
  echo "SAVE OUTFILE='$out/pspp-byte.sav' /COMPRESSED."
  echo "SAVE OUTFILE='$out/pspp.zsav' /ZCOMPRESSED."
  echo "MISSING VALUES employer ('Charity', 'n/a')."
  echo "SAVE OUTFILE='$out/pspp-longmiss.sav' /COMPRESSED."
  echo "NEW FILE."
  cat "$here/pspp-latin1.sps"
  echo "SAVE OUTFILE='$out/pspp-latin1.sav' /UNCOMPRESSED."
} > "$syntax"
pspp -O format=txt -o "$out/write-pspp-run.txt" "$syntax"
rm -f "$syntax" "$out/write-pspp-run.txt"
