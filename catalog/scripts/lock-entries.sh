#!/usr/bin/env bash
# Appends a line "id@version sha256" to catalog/versions.lock for every entry file not yet locked.
# It never rewrites a line: if a locked entry file has changed, it stops with an error, because a
# changed entry must be saved as a new version file (entries/<id>.v<N+1>.json), never edited in place.
# The hash is SHA-256 of the file's bytes with CRLF normalised to LF.
set -euo pipefail
cd "$(dirname "$0")/.."
lock=versions.lock
if [[ ! -f $lock ]]; then
  printf '%s\n' "# id@version sha256(entry file, LF line endings). Append-only: a changed entry gets a new version file, never an edit. Checked by tests/ExprModel.Data.Tests/Catalog/VersionLockTests.cs." > "$lock"
fi
status=0
for f in entries/*.json; do
  base=$(basename "$f" .json)          # <id>.v<version>
  id=${base%.v*}
  version=${base##*.v}
  key="$id@$version"
  hash=$(tr -d '\r' < "$f" | sha256sum | cut -d' ' -f1)
  locked=$(awk -v k="$key" '$1 == k { print $2 }' "$lock")
  if [[ -z $locked ]]; then
    printf '%s %s\n' "$key" "$hash" >> "$lock"
    echo "locked $key"
  elif [[ $locked != "$hash" ]]; then
    echo "error: $f changed after it was locked as $key; save the change as entries/$id.v$((version + 1)).json instead" >&2
    status=1
  fi
done
exit $status
