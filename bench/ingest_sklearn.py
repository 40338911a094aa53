#!/usr/bin/python3
"""The scikit-learn side of bench/ingest.sh: walk, read, tokenise and build
the TF-IDF matrix of a folder, timed, the way assay's ingest does it.

    /usr/bin/python3 bench/ingest_sklearn.py DIR [--stem] [--runs 3] [--ext .txt]

Each run walks DIR in lexical order (names starting with "." skipped, as
assay does), reads every file with one of the extensions (UTF-8, invalid
bytes replaced), and runs

    TfidfVectorizer(analyzer=analyse, sublinear_tf=True, smooth_idf=True,
                    norm="l2", min_df=2, max_df=0.5).fit_transform(texts)

The timed span is from the start of the walk to the end of fit_transform,
like assay's `timings.read` (walk + read + analyse + count + prune; the
weighting that scikit-learn does inside fit_transform is cheap).

`analyse` reproduces assay's token rule (textproc, doc.go) as closely as a
regular expression can: NFC (skipped for ASCII text, which NFC leaves
alone), full case folding (str.casefold), tokens that are runs of letters
and digits ([^\\W_]) joined by inner apostrophes (', U+2019, U+02BC, written
as '), the English stop list of textproc/stopwords.go (read from the Go
source, so the two never drift), then a trailing possessive "'s" removed,
pure numbers and tokens shorter than 2 characters dropped, the stop list
again. It does not cut Han, kana, Hangul or Thai into bigrams, nor keep
combining marks that follow a token, nor detect languages: on the corpora
benchmarked here (English-like text) that changes nothing measurable.
With --stem each kept token is stemmed with snowballstemmer's English
stemmer through a memo dict (one stemWord call per distinct token).

It prints one JSON object per run and one with the medians.
"""

import argparse
import json
import os
import re
import statistics
import sys
import time
import unicodedata

from sklearn.feature_extraction.text import TfidfVectorizer

HERE = os.path.dirname(os.path.abspath(__file__))


def english_stop_list():
    src = open(os.path.join(HERE, "..", "textproc", "stopwords.go"), encoding="utf-8").read()
    m = re.search(r"var englishStopWords = makeSet\(`(.*?)`\)", src, re.S)
    if not m:
        sys.exit("ingest_sklearn.py: no englishStopWords in textproc/stopwords.go")
    return frozenset(m.group(1).split())


STOP = english_stop_list()
TOKEN = re.compile(r"[^\W_]+(?:['\u2019\u02bc][^\W_]+)*")
APOSTROPHES = str.maketrans({"\u2019": "'", "\u02bc": "'"})


def make_analyser(stem):
    stemmer = None
    memo = {}
    if stem:
        import snowballstemmer

        stemmer = snowballstemmer.stemmer("english")

    def analyse(text):
        if not text.isascii():
            text = unicodedata.normalize("NFC", text)
        out = []
        for tok in TOKEN.findall(text.casefold()):
            if "\u2019" in tok or "\u02bc" in tok:
                tok = tok.translate(APOSTROPHES)
            if tok in STOP:
                continue
            if tok.endswith("'s"):
                tok = tok[:-2]
            if len(tok) < 2 or tok.isdigit() or tok in STOP:
                continue
            if stemmer is not None:
                s = memo.get(tok)
                if s is None:
                    s = memo[tok] = stemmer.stemWord(tok)
                tok = s
            out.append(tok)
        return out

    return analyse


def walk(root, exts):
    """Yields the files below root in lexical order of their slash paths,
    as io/fs.WalkDir visits them."""
    entries = sorted(os.listdir(root))
    for name in entries:
        if name.startswith("."):
            continue
        p = os.path.join(root, name)
        if os.path.isdir(p):
            yield from walk(p, exts)
        elif os.path.splitext(name)[1].lower() in exts:
            yield p


def run(root, stem, exts):
    start = time.perf_counter()
    texts = []
    size = 0
    for p in walk(root, exts):
        with open(p, "rb") as f:
            raw = f.read()
        size += len(raw)
        texts.append(raw.decode("utf-8", errors="replace"))
    vec = TfidfVectorizer(analyzer=make_analyser(stem), sublinear_tf=True, smooth_idf=True, norm="l2", min_df=2, max_df=0.5)
    x = vec.fit_transform(texts)
    seconds = time.perf_counter() - start
    return {"seconds": seconds, "documents": len(texts), "bytes": size, "terms": len(vec.vocabulary_), "nonzeros": int(x.nnz), "mb_per_s": size / 1e6 / seconds}


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("dir")
    ap.add_argument("--stem", action="store_true", help="memoised Snowball English stemming")
    ap.add_argument("--runs", type=int, default=3)
    ap.add_argument("--ext", action="append", help="file extensions to read (default .txt)")
    args = ap.parse_args()
    exts = set(e.lower() for e in (args.ext or [".txt"]))
    results = []
    for i in range(args.runs):
        r = run(args.dir, args.stem, exts)
        r["run"] = i + 1
        results.append(r)
        print(json.dumps(r), flush=True)
    med = dict(results[0])
    med.pop("run")
    med["seconds"] = statistics.median(r["seconds"] for r in results)
    med["mb_per_s"] = med["bytes"] / 1e6 / med["seconds"]
    med["median_of"] = len(results)
    med["stem"] = args.stem
    print(json.dumps(med), flush=True)


if __name__ == "__main__":
    main()
