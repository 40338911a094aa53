#!/usr/bin/python3
"""Generate tfidf.golden.json from tfidf-docs.txt using scikit-learn.

Run from the project root:
    /usr/bin/python3 testdata/reference/gen_tfidf.py

Each line of tfidf-docs.txt is one pre-analysed document whose tokens are
separated by single spaces. The analyzer only splits on ' ', so no further
text processing happens inside scikit-learn.
"""

import json
import os

import sklearn
from sklearn.feature_extraction.text import TfidfVectorizer

HERE = os.path.dirname(os.path.abspath(__file__))
DOCS = os.path.join(HERE, "tfidf-docs.txt")
OUT = os.path.join(HERE, "tfidf.golden.json")

CASES = [
    ("sublinear-smooth-l2", True, True, "l2"),
    ("raw-smooth-l2", False, True, "l2"),
    ("sublinear-plain-l2", True, False, "l2"),
    ("sublinear-smooth-none", True, True, None),
    ("raw-smooth-l1", False, True, "l1"),
]


def split_tokens(s):
    return s.split(" ")


def read_docs(path):
    with open(path, encoding="utf-8") as f:
        lines = f.read().split("\n")
    if lines and lines[-1] == "":
        lines.pop()
    for i, line in enumerate(lines):
        if line == "" or line != line.strip() or "  " in line:
            raise SystemExit("%s:%d: empty line or stray whitespace" % (path, i + 1))
    return lines


def main():
    docs = read_docs(DOCS)
    vocabulary = None
    cases = []
    for name, sublinear, smooth, norm in CASES:
        vec = TfidfVectorizer(
            analyzer=split_tokens,
            lowercase=False,
            sublinear_tf=sublinear,
            smooth_idf=smooth,
            norm=norm,
        )
        m = vec.fit_transform(docs)
        terms = [str(t) for t in vec.get_feature_names_out()]
        if vocabulary is None:
            vocabulary = terms
        elif terms != vocabulary:
            raise SystemExit("vocabulary differs between cases")
        cases.append({
            "name": name,
            "sublinear_tf": sublinear,
            "smooth_idf": smooth,
            "norm": "none" if norm is None else norm,
            "idf": [float(x) for x in vec.idf_],
            "matrix": [[float(x) for x in row] for row in m.toarray()],
        })

    golden = {
        "generator": "testdata/reference/gen_tfidf.py",
        "source": "scikit-learn %s TfidfVectorizer" % sklearn.__version__,
        "documents": "testdata/reference/tfidf-docs.txt",
        "vocabulary": vocabulary,
        "cases": cases,
    }
    with open(OUT, "w", encoding="utf-8") as f:
        json.dump(golden, f, indent=1)
        f.write("\n")


if __name__ == "__main__":
    main()
