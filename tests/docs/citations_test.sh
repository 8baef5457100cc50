#!/bin/sh
# Every document the project cites must ship with it: scans the sources,
# templates, sweeps, tools and docs for names of Markdown files and for paths
# that leave the repository, and fails on a cited file that does not exist.
#
#   tests/docs/citations_test.sh SOURCE_DIR
set -eu
root=$(cd "${1:?usage: citations_test.sh SOURCE_DIR}" && pwd)
cd "$root"
status=0
files=$(find README.md DEVELOPERS.md src netlists tests sweeps tools docs -type f \
  \( -name '*.cc' -o -name '*.h' -o -name '*.md' -o -name '*.cir' -o -name '*.lib' -o -name '*.xml' \
     -o -name '*.sh' -o -name '*.txt' -o -perm -u+x \) 2>/dev/null | grep -v '^tests/docs/citations_test.sh$')
# 1. Paths outside the repository.
for f in $files; do
  if grep -nE '\.\./shared/|/work/' "$f" >/dev/null 2>&1; then
    grep -nE '\.\./shared/|/work/' "$f" | sed "s|^|$f:|" >&2
    echo "citations: $f cites a path outside the repository" >&2
    status=1
  fi
done
# 2. Each NAME.md cited must exist, at the repository root, beside the citing
#    file, or as the path written.
for f in $files; do
  dir=$(dirname "$f")
  for cited in $(grep -oE '[A-Za-z0-9_./-]*[A-Za-z0-9_]\.md\b' "$f" 2>/dev/null | sort -u); do
    [ -e "$cited" ] || [ -e "$dir/$cited" ] || [ -e "netlists/$cited" ] || {
      echo "citations: $f cites $cited, which is not in the repository" >&2
      status=1
    }
  done
done
[ "$status" = 0 ] && echo "citations: every cited document is in the repository"
exit "$status"
