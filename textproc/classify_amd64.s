#include "textflag.h"

// Byte constants, sixteen copies each. The range tests are signed byte
// compares (PCMPGTB), right for ASCII; a byte with its high bit set stops
// the block before its classes matter.
#define SPLAT(name, v) DATA name<>+0(SB)/8, $v; DATA name<>+8(SB)/8, $v; GLOBL name<>(SB), RODATA|NOPTR, $16

SPLAT(c40, 0x4040404040404040) // 'A' - 1
SPLAT(c5b, 0x5b5b5b5b5b5b5b5b) // 'Z' + 1
SPLAT(c60, 0x6060606060606060) // 'a' - 1
SPLAT(c7b, 0x7b7b7b7b7b7b7b7b) // 'z' + 1
SPLAT(c2f, 0x2f2f2f2f2f2f2f2f) // '0' - 1
SPLAT(c3a, 0x3a3a3a3a3a3a3a3a) // '9' + 1
SPLAT(c27, 0x2727272727272727) // the apostrophe
SPLAT(c20, 0x2020202020202020) // the case bit

// CHUNK classifies the sixteen bytes at off(SI) into off(DI) and ORs
// their bits, shifted by off, into R8 (stops), R9 (alpha) and R10 (word).
#define CHUNK(off) \
	MOVOU off(SI), X0 \
	PMOVMSKB X0, AX \
	MOVOU X0, X1 \
	PCMPEQB X14, X1 \
	PMOVMSKB X1, BX \
	ORL BX, AX \
	SHLQ $off, AX \
	ORQ AX, R8 \
	MOVOU X0, X1 \
	PCMPGTB X8, X1 \
	MOVOU X9, X2 \
	PCMPGTB X0, X2 \
	PAND X2, X1 \
	MOVOU X0, X2 \
	PCMPGTB X10, X2 \
	MOVOU X11, X3 \
	PCMPGTB X0, X3 \
	PAND X3, X2 \
	POR X1, X2 \
	PMOVMSKB X2, AX \
	SHLQ $off, AX \
	ORQ AX, R9 \
	MOVOU X0, X3 \
	PCMPGTB X12, X3 \
	MOVOU X13, X4 \
	PCMPGTB X0, X4 \
	PAND X4, X3 \
	POR X2, X3 \
	PMOVMSKB X3, AX \
	SHLQ $off, AX \
	ORQ AX, R10 \
	PAND X7, X1 \
	POR X1, X0 \
	MOVOU X0, off(DI)

// func classifyASCII(dst, src *byte, lower bool) (word, alpha uint64, ok bool)
TEXT ·classifyASCII(SB), NOSPLIT, $0-41
	MOVQ dst+0(FP), DI
	MOVQ src+8(FP), SI
	MOVOU c40<>(SB), X8
	MOVOU c5b<>(SB), X9
	MOVOU c60<>(SB), X10
	MOVOU c7b<>(SB), X11
	MOVOU c2f<>(SB), X12
	MOVOU c3a<>(SB), X13
	MOVOU c27<>(SB), X14
	MOVOU c20<>(SB), X7
	MOVBLZX lower+16(FP), AX
	TESTL AX, AX
	JNZ keepcase
	PXOR X7, X7 // no lower-casing: add no case bit
keepcase:
	XORQ R8, R8
	XORQ R9, R9
	XORQ R10, R10
	CHUNK(0)
	CHUNK(16)
	CHUNK(32)
	CHUNK(48)
	MOVQ R10, word+24(FP)
	MOVQ R9, alpha+32(FP)
	TESTQ R8, R8
	SETEQ ok+40(FP)
	RET
