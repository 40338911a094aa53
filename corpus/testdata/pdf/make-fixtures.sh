#!/bin/sh
# Writes the PDF fixtures of this folder with real producers, so that the
# PDF reader is tested on more than hand-made files. Needs Debian's
# ghostscript and qpdf (apt-get install ghostscript qpdf). Run from this
# folder: sh make-fixtures.sh. All text is invented.
set -eu
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT

# Two pages of text in standard fonts, an Info title set by pdfmark.
cat >"$tmp/text.ps" <<'PS'
%!PS
/Helvetica findfont 14 scalefont setfont
72 720 moveto (Quarterly notes on the orchard irrigation trial) show
/Helvetica findfont 11 scalefont setfont
72 690 moveto (The drip lines on the north slope were flushed twice.) show
72 675 moveto (Moisture sensors read between 18 and 24 percent.) show
showpage
/Times-Roman findfont 12 scalefont setfont
72 720 moveto (Second page: pruning schedule for the pear rows.) show
showpage
PS
gs -q -dNOPAUSE -dBATCH -dSAFER -sDEVICE=pdfwrite -sOutputFile=ghostscript.pdf \
	-c "[ /Title (Orchard trial notes) /DOCINFO pdfmark" -f "$tmp/text.ps"

# The same file rewritten with object streams and a cross-reference
# stream (PDF 1.5 structure).
qpdf --object-streams=generate ghostscript.pdf objstm.pdf

# Encrypted with a user password (AES-128), and with an empty user
# password (RC4 40-bit): both are skipped as encrypted.
qpdf --encrypt reader-pass owner-pass 128 --use-aes=y -- ghostscript.pdf encrypted-aes.pdf
qpdf --allow-weak-crypto --encrypt "" owner-pass 40 -- ghostscript.pdf encrypted-empty-user.pdf

# A "scan": one page that only draws an image, no text.
cat >"$tmp/scan.ps" <<'PS'
%!PS
72 500 translate 300 200 scale
8 4 8 [8 0 0 4 0 0]
{<00ff00ff00ff00ff ff00ff00ff00ff00 00ff00ff00ff00ff ff00ff00ff00ff00>}
image
showpage
PS
gs -q -dNOPAUSE -dBATCH -dSAFER -sDEVICE=pdfwrite -sOutputFile=scanned.pdf "$tmp/scan.ps"
