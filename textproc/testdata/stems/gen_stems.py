#!/usr/bin/python3
"""Write the stem golden files textproc/testdata/stems/<language>.tsv.

Run with Debian's Python, from any directory:

    apt-get install python3-snowballstemmer snowball-data
    /usr/bin/python3 textproc/testdata/stems/gen_stems.py

Words: a fixed sample of the Snowball vocabulary of each language, as
shipped by Debian's snowball-data package (0+20210120-1) in
/usr/share/snowball/data/<language>/voc.txt: every k-th line, starting with
the first, with k = max(1, len(vocabulary) // TARGET), so each file has at
least TARGET words.

Stems: python3-snowballstemmer (2.2.0 on Debian bookworm), the Python port
generated from the Snowball reference implementation, stemmer(<language>)
.stemWord(word). Before writing, the script checks that every stem of the
sample equals the stem in the package's output.txt beside voc.txt (the
reference output that ships with the vocabulary) and stops if one differs.

Format: lines starting with '#' are comments; every other line is
word<TAB>stem, in vocabulary order.
"""

import os
import subprocess
import sys

import snowballstemmer

LANGUAGES = ["english", "french", "spanish", "russian", "swedish", "norwegian", "hungarian"]
TARGET = 4000
DATA = "/usr/share/snowball/data"
OUT = os.path.dirname(os.path.abspath(__file__))


def read_lines(path):
    with open(path, encoding="utf-8") as f:
        return [line.rstrip("\n") for line in f]


def debian_version(package):
    out = subprocess.run(["dpkg-query", "-W", "-f=${Version}", package], capture_output=True, text=True)
    return out.stdout.strip() or "unknown"


def main():
    stemmer_version = debian_version("python3-snowballstemmer")
    data_version = debian_version("snowball-data")
    for lang in LANGUAGES:
        words = read_lines(os.path.join(DATA, lang, "voc.txt"))
        reference = read_lines(os.path.join(DATA, lang, "output.txt"))
        if len(words) != len(reference):
            sys.exit(f"{lang}: voc.txt and output.txt differ in length")
        step = max(1, len(words) // TARGET)
        stemmer = snowballstemmer.stemmer(lang)
        rows = []
        for i in range(0, len(words), step):
            word = words[i]
            if not word or "\t" in word:
                continue
            stem = stemmer.stemWord(word)
            if stem != reference[i]:
                sys.exit(f"{lang}: {word!r}: snowballstemmer gives {stem!r}, output.txt {reference[i]!r}")
            rows.append((word, stem))
        path = os.path.join(OUT, lang + ".tsv")
        with open(path, "w", encoding="utf-8", newline="\n") as f:
            f.write(f"# {lang}: word<TAB>stem. Written by textproc/testdata/stems/gen_stems.py\n")
            f.write(f"# (run with /usr/bin/python3). Words: every {step}th line of {DATA}/{lang}/voc.txt\n")
            f.write(f"# (Debian snowball-data {data_version}). Stems: Debian python3-snowballstemmer\n")
            f.write(f"# {stemmer_version}; each equals the stem in output.txt of snowball-data.\n")
            for word, stem in rows:
                f.write(f"{word}\t{stem}\n")
        print(f"{lang}: {len(rows)} words (every {step}th of {len(words)}) -> {path}")


if __name__ == "__main__":
    main()
