#!/usr/bin/env bash
# Derives catalog/genes/identifiers.csv (aliases, Ensembl gene ids and Entrez ids of the channel genes listed in
# catalog/genes/status.csv) and catalog/genes/identifiers.provenance.json from Debian's r-bioc-org.hs.eg.db, and
# checks that every human gene annotated GO:0005244 (voltage-gated ion channel activity) in that package, plus the
# KCNK*, KCNN* and KCNMA1 genes, has a row in status.csv.
#
# Usage: catalog/scripts/derive-identifiers.sh [CACHE_DIR]      (default /tmp/exprmodel-orghs)
# Needs apt-get, dpkg and python3 (stdlib sqlite3); no R. Runs 'apt-get update' only when the download fails.
set -euo pipefail
here=$(cd "$(dirname "$0")" && pwd)
catalog=$(cd "$here/.." && pwd)
cache=${1:-/tmp/exprmodel-orghs}
package=r-bioc-org.hs.eg.db
mkdir -p "$cache"
cd "$cache"
if ! ls ${package}_*.deb >/dev/null 2>&1; then
  apt-get download "$package" || { apt-get update >/dev/null && apt-get download "$package"; }
fi
deb=$(ls ${package}_*.deb | sort | tail -n 1)
sqlite="$cache/root/usr/lib/R/site-library/org.Hs.eg.db/extdata/org.Hs.eg.sqlite"
if [[ ! -f $sqlite ]]; then
  rm -rf "$cache/root"
  dpkg -x "$deb" "$cache/root"
fi
version=$(dpkg-deb -f "$deb" Version)

python3 - "$sqlite" "$catalog" "$package" "$version" "$(basename "$0")" <<'PY'
import csv, datetime, json, re, sqlite3, sys
db, catalog, package, version, script = sys.argv[1:6]
con = sqlite3.connect(f"file:{db}?mode=ro", uri=True)

statuses = {}
with open(f"{catalog}/genes/status.csv", newline="") as f:
    for row in csv.reader(line for line in f if not line.startswith("#")):
        if row[0] == "species":
            continue
        if row[0] == "human":
            statuses[row[1]] = row[2]

# The GO:0005244 list check: every annotated human gene (and the K2P/KCNN/KCNMA1 genes) must be classified.
go = {r[0] for r in con.execute(
    "SELECT DISTINCT g.symbol FROM go_mf_all m JOIN gene_info g ON g._id = m._id WHERE m.go_id = 'GO:0005244'")}
extra = {r[0] for r in con.execute("SELECT symbol FROM gene_info") if re.fullmatch(r"KCNK\d+|KCNN\d|KCNMA1", r[0])}
missing = sorted((go | extra) - statuses.keys())
if missing:
    sys.exit("status.csv lacks these genes of GO:0005244 / KCNK / KCNN / KCNMA1: " + " ".join(missing))

rows = set()
unknown = []
for symbol in sorted(statuses):
    hit = con.execute("SELECT g._id, n.gene_id FROM gene_info g JOIN genes n ON n._id = g._id WHERE g.symbol = ?", (symbol,)).fetchone()
    if hit is None:
        unknown.append(symbol)
        continue
    gid, entrez = hit
    rows.add((entrez, "entrez", symbol))
    for (alias,) in con.execute("SELECT alias_symbol FROM alias WHERE _id = ?", (gid,)):
        if alias != symbol and "," not in alias:
            rows.add((alias, "alias", symbol))
    for (ens,) in con.execute("SELECT ensembl_id FROM ensembl WHERE _id = ?", (gid,)):
        rows.add((ens, "ensembl", symbol))
if unknown:
    sys.exit("status.csv symbols that are not official symbols in the package: " + " ".join(unknown))

with open(f"{catalog}/genes/identifiers.csv", "w", newline="") as f:
    f.write("identifier,kind,symbol,species\n")
    for identifier, kind, symbol in sorted(rows, key=lambda r: (r[2], r[1], r[0])):
        f.write(f"{identifier},{kind},{symbol},human\n")

meta = dict(con.execute("SELECT name, value FROM metadata"))
provenance = {
    "package": package,
    "packageVersion": version,
    "sourceFile": "usr/lib/R/site-library/org.Hs.eg.db/extdata/org.Hs.eg.sqlite",
    "entrezGeneSourceDate": meta.get("EGSOURCEDATE", ""),
    "ensemblSourceDate": meta.get("ENSOURCEDATE", ""),
    "goSourceDate": meta.get("GOSOURCEDATE", ""),
    "goAnnotationSourceDate": meta.get("GOEGSOURCEDATE", ""),
    "script": "catalog/scripts/" + script,
    "generated": datetime.datetime.now(datetime.timezone.utc).strftime("%Y-%m-%d"),
    "genes": str(len(statuses)),
    "identifiers": str(len(rows)),
}
with open(f"{catalog}/genes/identifiers.provenance.json", "w") as f:
    json.dump(provenance, f, indent=2)
    f.write("\n")
print(f"{len(rows)} identifiers for {len(statuses)} genes; GO:0005244 check passed ({len(go)} annotated genes)")
PY
