;; The PNG writer's byte loops (png.ts) as WebAssembly: RGBA rows packed into PNG scanlines (a
;; filter-type byte 0, then RGB), and the Adler-32 checksum zlib puts at the end of the image
;; data (RFC 1950, section 8.2). Both give the same bytes as the TypeScript loops in png.ts
;; (png.spec.ts compares them, and Adler-32 with zlib's own). Compiled by
;; `npx tsx scripts/gen-wasm.ts` into png-wasm.ts.
(module
  (memory (export "memory") 1)

  ;; `rows` rows of `width` RGBA pixels at `src` into scanlines at `dst`: per row the byte 0 (no
  ;; filter), then R, G, B of each pixel. Four pixels a step (16 bytes in, 12 out; each 16-byte
  ;; store runs 4 bytes past its 12, which the next store or the next row's bytes overwrite, so
  ;; `dst` needs 4 bytes of slack at its end), the last 0–3 pixels of a row one at a time.
  (func (export "packRows") (param $src i32) (param $dst i32) (param $width i32) (param $rows i32)
    (local $y i32) (local $x i32) (local $s i32) (local $d i32) (local $quads i32)
    (local.set $quads (i32.and (local.get $width) (i32.const -4)))
    (local.set $s (local.get $src))
    (local.set $d (local.get $dst))
    (block $done (loop $row
      (br_if $done (i32.ge_u (local.get $y) (local.get $rows)))
      (i32.store8 (local.get $d) (i32.const 0))
      (local.set $d (i32.add (local.get $d) (i32.const 1)))
      (local.set $x (i32.const 0))
      (block $quadsDone (loop $quad
        (br_if $quadsDone (i32.ge_u (local.get $x) (local.get $quads)))
        (v128.store (local.get $d)
          (i8x16.shuffle 0 1 2 4 5 6 8 9 10 12 13 14 0 0 0 0 (v128.load (local.get $s)) (v128.load (local.get $s))))
        (local.set $s (i32.add (local.get $s) (i32.const 16)))
        (local.set $d (i32.add (local.get $d) (i32.const 12)))
        (local.set $x (i32.add (local.get $x) (i32.const 4)))
        (br $quad)))
      (block $tailDone (loop $tail
        (br_if $tailDone (i32.ge_u (local.get $x) (local.get $width)))
        (i32.store8 (local.get $d) (i32.load8_u (local.get $s)))
        (i32.store8 offset=1 (local.get $d) (i32.load8_u offset=1 (local.get $s)))
        (i32.store8 offset=2 (local.get $d) (i32.load8_u offset=2 (local.get $s)))
        (local.set $s (i32.add (local.get $s) (i32.const 4)))
        (local.set $d (i32.add (local.get $d) (i32.const 3)))
        (local.set $x (i32.add (local.get $x) (i32.const 1)))
        (br $tail)))
      (local.set $y (i32.add (local.get $y) (i32.const 1)))
      (br $row))))

  ;; Adler-32 of `len` bytes at `p`, continuing from `adler` (1 to start): s1 = 1 + Σ b, s2 = Σ s1
  ;; after each byte, both mod 65521. In blocks of up to 5552 bytes (zlib's NMAX), 16 bytes a
  ;; step: over a block of n bytes that starts from s1, s2,
  ;;   s1' = s1 + Σ b_j,  s2' = s2 + n·s1 + Σ_j (n − j)·b_j,
  ;; and with j = 16k + i, (n − j) = 16·(steps after step k) + (16 − i): so s2 gains 16 × the sum
  ;; of the byte sums before each step (vps) plus each step's bytes weighted 16 … 1 (vs2). The
  ;; lanes stay far below 2³²; the block's sums are combined in 64 bits. The last 0–15 bytes go
  ;; one at a time.
  (func (export "adler32") (param $adler i32) (param $p i32) (param $len i32) (result i32)
    (local $s1 i64) (local $s2 i64) (local $n i32) (local $end i32)
    (local $v v128) (local $vs1 v128) (local $vs2 v128) (local $vps v128)
    (local.set $s1 (i64.extend_i32_u (i32.and (local.get $adler) (i32.const 0xffff))))
    (local.set $s2 (i64.extend_i32_u (i32.shr_u (local.get $adler) (i32.const 16))))
    (block $blocksDone (loop $block
      (br_if $blocksDone (i32.lt_u (local.get $len) (i32.const 16)))
      (local.set $n (select (i32.const 5552) (i32.and (local.get $len) (i32.const -16))
        (i32.gt_u (local.get $len) (i32.const 5552))))
      (local.set $len (i32.sub (local.get $len) (local.get $n)))
      (local.set $end (i32.add (local.get $p) (local.get $n)))
      (local.set $vs1 (v128.const i32x4 0 0 0 0))
      (local.set $vs2 (v128.const i32x4 0 0 0 0))
      (local.set $vps (v128.const i32x4 0 0 0 0))
      (loop $step
        (local.set $v (v128.load (local.get $p)))
        (local.set $vps (i32x4.add (local.get $vps) (local.get $vs1)))
        (local.set $vs1 (i32x4.add (local.get $vs1)
          (i32x4.extadd_pairwise_i16x8_u (i16x8.extadd_pairwise_i8x16_u (local.get $v)))))
        (local.set $vs2 (i32x4.add (local.get $vs2) (i32x4.add
          (i32x4.dot_i16x8_s (i16x8.extend_low_i8x16_u (local.get $v)) (v128.const i16x8 16 15 14 13 12 11 10 9))
          (i32x4.dot_i16x8_s (i16x8.extend_high_i8x16_u (local.get $v)) (v128.const i16x8 8 7 6 5 4 3 2 1)))))
        (local.set $p (i32.add (local.get $p) (i32.const 16)))
        (br_if $step (i32.lt_u (local.get $p) (local.get $end))))
      (local.set $s2 (i64.rem_u
        (i64.add (i64.add (local.get $s2) (i64.mul (local.get $s1) (i64.extend_i32_u (local.get $n))))
          (i64.add (i64.shl (call $sum (local.get $vps)) (i64.const 4)) (call $sum (local.get $vs2))))
        (i64.const 65521)))
      (local.set $s1 (i64.rem_u (i64.add (local.get $s1) (call $sum (local.get $vs1))) (i64.const 65521)))
      (br $block)))
    (block $tailDone (loop $tail
      (br_if $tailDone (i32.eqz (local.get $len)))
      (local.set $s1 (i64.add (local.get $s1) (i64.extend_i32_u (i32.load8_u (local.get $p)))))
      (local.set $s2 (i64.add (local.get $s2) (local.get $s1)))
      (local.set $p (i32.add (local.get $p) (i32.const 1)))
      (local.set $len (i32.sub (local.get $len) (i32.const 1)))
      (br $tail)))
    (i32.wrap_i64 (i64.or
      (i64.rem_u (local.get $s1) (i64.const 65521))
      (i64.shl (i64.rem_u (local.get $s2) (i64.const 65521)) (i64.const 16)))))

  ;; The four unsigned 32-bit lanes of v added in 64 bits.
  (func $sum (param $v v128) (result i64)
    (i64.add
      (i64.add (i64.extend_i32_u (i32x4.extract_lane 0 (local.get $v))) (i64.extend_i32_u (i32x4.extract_lane 1 (local.get $v))))
      (i64.add (i64.extend_i32_u (i32x4.extract_lane 2 (local.get $v))) (i64.extend_i32_u (i32x4.extract_lane 3 (local.get $v)))))))
