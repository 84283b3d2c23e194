;; The glow blur's extended-box passes (blur.ts) as WebAssembly SIMD kernels, two samples per
;; instruction in double precision. Each sample goes through the same operations in the same
;; order as the TypeScript passes — float32 in, promoted to float64, no fused multiply-add,
;; rounded to float32 on the way out — so the two give the same bits (blur-kernels.spec.ts).
;; Compiled by `npx tsx scripts/gen-wasm.ts` into blur-wasm.ts.
;;
;; Buffers carry zero margins of p = r + 1 samples (across) or rows (down) on both sides, so the
;; window never needs an edge check: adding a zero leaves a sum of light unchanged.
(module
  (memory (export "memory") 1)

  ;; One vertical pass over a band `w` columns wide and `h` rows high: `src` and `dst` are the
  ;; byte addresses of row 0 (rows w float32s apart, p zero rows above and below), `sums` w
  ;; float64s. Columns go in pairs; an odd last column on its own.
  (func $down (param $src i32) (param $dst i32) (param $sums i32) (param $w i32) (param $h i32) (param $r i32)
              (param $c f64) (param $ca f64)
    (local $rowBytes i32) (local $pairs i32) (local $x i32) (local $y i32) (local $k i32)
    (local $lo i32) (local $hi i32) (local $leave i32) (local $out i32) (local $sp i32) (local $o i32)
    (local $cv v128) (local $cav v128) (local $s v128) (local $enter v128) (local $ss f64) (local $se f64)
    (local.set $rowBytes (i32.shl (local.get $w) (i32.const 2)))
    (local.set $pairs (i32.and (local.get $w) (i32.const -2)))
    (local.set $cv (f64x2.splat (local.get $c)))
    (local.set $cav (f64x2.splat (local.get $ca)))
    ;; sums = rows 0 … r, added in order from zero.
    (memory.fill (local.get $sums) (i32.const 0) (i32.shl (local.get $w) (i32.const 3)))
    (local.set $k (i32.const 0))
    (block $sumsDone (loop $sumRows
      (br_if $sumsDone (i32.gt_s (local.get $k) (local.get $r)))
      (local.set $lo (i32.add (local.get $src) (i32.mul (local.get $k) (local.get $rowBytes))))
      (local.set $x (i32.const 0))
      (block $rowDone (loop $sumColumns
        (br_if $rowDone (i32.ge_u (local.get $x) (local.get $w)))
        (local.set $sp (i32.add (local.get $sums) (i32.shl (local.get $x) (i32.const 3))))
        (f64.store (local.get $sp)
          (f64.add (f64.load (local.get $sp))
                   (f64.promote_f32 (f32.load (i32.add (local.get $lo) (i32.shl (local.get $x) (i32.const 2)))))))
        (local.set $x (i32.add (local.get $x) (i32.const 1)))
        (br $sumColumns)))
      (local.set $k (i32.add (local.get $k) (i32.const 1)))
      (br $sumRows)))
    ;; Row y: out = c·s + cα·(lo + enter); then s += enter − leave.
    (local.set $y (i32.const 0))
    (block $rowsDone (loop $rows
      (br_if $rowsDone (i32.ge_s (local.get $y) (local.get $h)))
      (local.set $lo (i32.add (local.get $src) (i32.mul (i32.sub (local.get $y) (i32.add (local.get $r) (i32.const 1))) (local.get $rowBytes))))
      (local.set $hi (i32.add (local.get $src) (i32.mul (i32.add (local.get $y) (i32.add (local.get $r) (i32.const 1))) (local.get $rowBytes))))
      (local.set $leave (i32.add (local.get $src) (i32.mul (i32.sub (local.get $y) (local.get $r)) (local.get $rowBytes))))
      (local.set $out (i32.add (local.get $dst) (i32.mul (local.get $y) (local.get $rowBytes))))
      (local.set $x (i32.const 0))
      (block $pairsDone (loop $columnPairs
        (br_if $pairsDone (i32.ge_u (local.get $x) (local.get $pairs)))
        (local.set $sp (i32.add (local.get $sums) (i32.shl (local.get $x) (i32.const 3))))
        (local.set $o (i32.shl (local.get $x) (i32.const 2)))
        (local.set $s (v128.load (local.get $sp)))
        (local.set $enter (f64x2.promote_low_f32x4 (v128.load64_zero (i32.add (local.get $hi) (local.get $o)))))
        (v128.store64_lane 0 (i32.add (local.get $out) (local.get $o))
          (f32x4.demote_f64x2_zero
            (f64x2.add
              (f64x2.mul (local.get $cv) (local.get $s))
              (f64x2.mul (local.get $cav)
                (f64x2.add (f64x2.promote_low_f32x4 (v128.load64_zero (i32.add (local.get $lo) (local.get $o))))
                           (local.get $enter))))))
        (v128.store (local.get $sp)
          (f64x2.add (local.get $s)
            (f64x2.sub (local.get $enter)
                       (f64x2.promote_low_f32x4 (v128.load64_zero (i32.add (local.get $leave) (local.get $o)))))))
        (local.set $x (i32.add (local.get $x) (i32.const 2)))
        (br $columnPairs)))
      (if (i32.lt_u (local.get $pairs) (local.get $w))
        (then
          (local.set $sp (i32.add (local.get $sums) (i32.shl (local.get $pairs) (i32.const 3))))
          (local.set $o (i32.shl (local.get $pairs) (i32.const 2)))
          (local.set $ss (f64.load (local.get $sp)))
          (local.set $se (f64.promote_f32 (f32.load (i32.add (local.get $hi) (local.get $o)))))
          (f32.store (i32.add (local.get $out) (local.get $o))
            (f32.demote_f64
              (f64.add (f64.mul (local.get $c) (local.get $ss))
                       (f64.mul (local.get $ca)
                         (f64.add (f64.promote_f32 (f32.load (i32.add (local.get $lo) (local.get $o)))) (local.get $se))))))
          (f64.store (local.get $sp)
            (f64.add (local.get $ss)
              (f64.sub (local.get $se) (f64.promote_f32 (f32.load (i32.add (local.get $leave) (local.get $o)))))))))
      (local.set $y (i32.add (local.get $y) (i32.const 1)))
      (br $rows))))

  ;; `passes` vertical passes, ping-ponging between two padded bands; returns the one holding
  ;; the result (row 0's byte address).
  (func (export "downBand") (param $a i32) (param $b i32) (param $sums i32) (param $w i32) (param $h i32) (param $r i32)
                            (param $c f64) (param $ca f64) (param $passes i32) (result i32)
    (local $t i32)
    (block $done (loop $pass
      (br_if $done (i32.le_s (local.get $passes) (i32.const 0)))
      (call $down (local.get $a) (local.get $b) (local.get $sums) (local.get $w) (local.get $h) (local.get $r) (local.get $c) (local.get $ca))
      (local.set $t (local.get $a))
      (local.set $a (local.get $b))
      (local.set $b (local.get $t))
      (local.set $passes (i32.sub (local.get $passes) (i32.const 1)))
      (br $pass)))
    (local.get $a))

  ;; One horizontal pass over two rows held interleaved (sample i of both at byte 8·i from
  ;; position 0, p zero positions either side): out = c·(s + α·(lo + hi)); then s += hi − leave.
  (func $across (param $from i32) (param $to i32) (param $w i32) (param $r i32) (param $c f64) (param $alpha f64)
    (local $i i32) (local $at i32) (local $reach i32) (local $cv v128) (local $av v128) (local $s v128) (local $lo v128) (local $hi v128)
    (local.set $cv (f64x2.splat (local.get $c)))
    (local.set $av (f64x2.splat (local.get $alpha)))
    (local.set $reach (i32.shl (i32.add (local.get $r) (i32.const 1)) (i32.const 3)))
    (local.set $s (f64x2.splat (f64.const 0)))
    (local.set $i (i32.const 0))
    (block $sumDone (loop $sum
      (br_if $sumDone (i32.gt_s (local.get $i) (local.get $r)))
      (local.set $s (f64x2.add (local.get $s)
        (f64x2.promote_low_f32x4 (v128.load64_zero (i32.add (local.get $from) (i32.shl (local.get $i) (i32.const 3)))))))
      (local.set $i (i32.add (local.get $i) (i32.const 1)))
      (br $sum)))
    (local.set $i (i32.const 0))
    (block $done (loop $positions
      (br_if $done (i32.ge_u (local.get $i) (local.get $w)))
      (local.set $at (i32.shl (local.get $i) (i32.const 3)))
      (local.set $lo (f64x2.promote_low_f32x4 (v128.load64_zero (i32.sub (i32.add (local.get $from) (local.get $at)) (local.get $reach)))))
      (local.set $hi (f64x2.promote_low_f32x4 (v128.load64_zero (i32.add (i32.add (local.get $from) (local.get $at)) (local.get $reach)))))
      (v128.store64_lane 0 (i32.add (local.get $to) (local.get $at))
        (f32x4.demote_f64x2_zero
          (f64x2.mul (local.get $cv)
            (f64x2.add (local.get $s) (f64x2.mul (local.get $av) (f64x2.add (local.get $lo) (local.get $hi)))))))
      (local.set $s (f64x2.add (local.get $s)
        (f64x2.sub (local.get $hi)
          (f64x2.promote_low_f32x4 (v128.load64_zero
            (i32.sub (i32.add (local.get $from) (local.get $at)) (i32.shl (local.get $r) (i32.const 3))))))))
      (local.set $i (i32.add (local.get $i) (i32.const 1)))
      (br $positions))))

  ;; Rows a and b (w float32s each) through `passes` horizontal passes, back in place. `p0` and
  ;; `p1` are the byte addresses of position 0 of two interleaved buffers with zero margins.
  (func (export "acrossRows") (param $a i32) (param $b i32) (param $p0 i32) (param $p1 i32) (param $w i32) (param $r i32)
                              (param $c f64) (param $alpha f64) (param $passes i32)
    (local $i i32) (local $quads i32) (local $va v128) (local $vb v128) (local $t i32)
    (local.set $quads (i32.and (local.get $w) (i32.const -4)))
    ;; Interleave: a0 b0 a1 b1 …
    (local.set $i (i32.const 0))
    (block $inDone (loop $in
      (br_if $inDone (i32.ge_u (local.get $i) (local.get $quads)))
      (local.set $va (v128.load (i32.add (local.get $a) (i32.shl (local.get $i) (i32.const 2)))))
      (local.set $vb (v128.load (i32.add (local.get $b) (i32.shl (local.get $i) (i32.const 2)))))
      (v128.store (i32.add (local.get $p0) (i32.shl (local.get $i) (i32.const 3)))
        (i8x16.shuffle 0 1 2 3 16 17 18 19 4 5 6 7 20 21 22 23 (local.get $va) (local.get $vb)))
      (v128.store offset=16 (i32.add (local.get $p0) (i32.shl (local.get $i) (i32.const 3)))
        (i8x16.shuffle 8 9 10 11 24 25 26 27 12 13 14 15 28 29 30 31 (local.get $va) (local.get $vb)))
      (local.set $i (i32.add (local.get $i) (i32.const 4)))
      (br $in)))
    (block $inTailDone (loop $inTail
      (br_if $inTailDone (i32.ge_u (local.get $i) (local.get $w)))
      (f32.store (i32.add (local.get $p0) (i32.shl (local.get $i) (i32.const 3)))
        (f32.load (i32.add (local.get $a) (i32.shl (local.get $i) (i32.const 2)))))
      (f32.store offset=4 (i32.add (local.get $p0) (i32.shl (local.get $i) (i32.const 3)))
        (f32.load (i32.add (local.get $b) (i32.shl (local.get $i) (i32.const 2)))))
      (local.set $i (i32.add (local.get $i) (i32.const 1)))
      (br $inTail)))
    ;; The passes, ping-ponging.
    (block $passesDone (loop $pass
      (br_if $passesDone (i32.le_s (local.get $passes) (i32.const 0)))
      (call $across (local.get $p0) (local.get $p1) (local.get $w) (local.get $r) (local.get $c) (local.get $alpha))
      (local.set $t (local.get $p0))
      (local.set $p0 (local.get $p1))
      (local.set $p1 (local.get $t))
      (local.set $passes (i32.sub (local.get $passes) (i32.const 1)))
      (br $pass)))
    ;; De-interleave the result (now in p0) back into a and b.
    (local.set $i (i32.const 0))
    (block $outDone (loop $out
      (br_if $outDone (i32.ge_u (local.get $i) (local.get $quads)))
      (local.set $va (v128.load (i32.add (local.get $p0) (i32.shl (local.get $i) (i32.const 3)))))
      (local.set $vb (v128.load offset=16 (i32.add (local.get $p0) (i32.shl (local.get $i) (i32.const 3)))))
      (v128.store (i32.add (local.get $a) (i32.shl (local.get $i) (i32.const 2)))
        (i8x16.shuffle 0 1 2 3 8 9 10 11 16 17 18 19 24 25 26 27 (local.get $va) (local.get $vb)))
      (v128.store (i32.add (local.get $b) (i32.shl (local.get $i) (i32.const 2)))
        (i8x16.shuffle 4 5 6 7 12 13 14 15 20 21 22 23 28 29 30 31 (local.get $va) (local.get $vb)))
      (local.set $i (i32.add (local.get $i) (i32.const 4)))
      (br $out)))
    (block $outTailDone (loop $outTail
      (br_if $outTailDone (i32.ge_u (local.get $i) (local.get $w)))
      (f32.store (i32.add (local.get $a) (i32.shl (local.get $i) (i32.const 2)))
        (f32.load (i32.add (local.get $p0) (i32.shl (local.get $i) (i32.const 3)))))
      (f32.store (i32.add (local.get $b) (i32.shl (local.get $i) (i32.const 2)))
        (f32.load offset=4 (i32.add (local.get $p0) (i32.shl (local.get $i) (i32.const 3)))))
      (local.set $i (i32.add (local.get $i) (i32.const 1)))
      (br $outTail))))

  ;; One row spread from a coarser one (ExpandedRows in types.ts): out[c·m + k] = (src[c]·w)·across[k]
  ;; for c < cols, k < m, in float64, rounded to float32. `across` holds m float64s.
  (func (export "expandRow") (param $src i32) (param $out i32) (param $cols i32) (param $m i32) (param $w f64) (param $across i32)
    (local $c i32) (local $k i32) (local $e f64)
    (block $done (loop $cells
      (br_if $done (i32.ge_u (local.get $c) (local.get $cols)))
      (local.set $e (f64.mul (f64.promote_f32 (f32.load (i32.add (local.get $src) (i32.shl (local.get $c) (i32.const 2))))) (local.get $w)))
      (local.set $k (i32.const 0))
      (block $samplesDone (loop $samples
        (br_if $samplesDone (i32.ge_u (local.get $k) (local.get $m)))
        (f32.store (local.get $out)
          (f32.demote_f64 (f64.mul (local.get $e) (f64.load (i32.add (local.get $across) (i32.shl (local.get $k) (i32.const 3)))))))
        (local.set $out (i32.add (local.get $out) (i32.const 4)))
        (local.set $k (i32.add (local.get $k) (i32.const 1)))
        (br $samples)))
      (local.set $c (i32.add (local.get $c) (i32.const 1)))
      (br $cells))))
)
