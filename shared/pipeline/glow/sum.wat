;; Summing the glow components (glow.ts) as WebAssembly: the halo's ring spread, and a coarse
;; component interpolated onto the finer grid. Each sample goes through the same operations in
;; the same order as the TypeScript loops (float32 values promoted to float64, no fused
;; multiply-add, rounded to float32 where those store), so the two give the same bits
;; (sum-kernels.spec.ts). Compiled by `npx tsx scripts/gen-wasm.ts` into sum-wasm.ts.
(module
  (memory (export "memory") 1)

  ;; Rows [y0, y1) of a width × height field (`data`, f32) spread over a ring of n offsets
  ;; (`ring`: dx, dy pairs, i32): out = scale · Σ data[y + dy, x + dx] over the offsets inside
  ;; the field, summed in offset order in float64 from zero. `bases` and `shifts` are scratch
  ;; for n i32 each. Columns where every offset is inside go two at a time.
  (func (export "ringRows") (param $data i32) (param $width i32) (param $height i32) (param $ring i32) (param $n i32)
                            (param $y0 i32) (param $y1 i32) (param $out i32) (param $scale f64) (param $bases i32) (param $shifts i32)
    (local $y i32) (local $k i32) (local $taps i32) (local $lo i32) (local $hi i32) (local $dx i32) (local $sy i32)
    (local $x i32) (local $o i32) (local $sx i32) (local $sum f64) (local $s v128) (local $x4 i32)
    (local.set $y (local.get $y0))
    (block $rowsDone (loop $rows
      (br_if $rowsDone (i32.ge_s (local.get $y) (local.get $y1)))
      ;; The offsets whose row lies inside the field, and the columns where all of them do too.
      (local.set $taps (i32.const 0))
      (local.set $lo (i32.const 0))
      (local.set $hi (local.get $width))
      (local.set $k (i32.const 0))
      (block $offsetsDone (loop $offsets
        (br_if $offsetsDone (i32.ge_s (local.get $k) (local.get $n)))
        (local.set $sy (i32.add (local.get $y) (i32.load offset=4 (i32.add (local.get $ring) (i32.shl (local.get $k) (i32.const 3))))))
        (if (i32.and (i32.ge_s (local.get $sy) (i32.const 0)) (i32.lt_s (local.get $sy) (local.get $height)))
          (then
            (local.set $dx (i32.load (i32.add (local.get $ring) (i32.shl (local.get $k) (i32.const 3)))))
            (i32.store (i32.add (local.get $shifts) (i32.shl (local.get $taps) (i32.const 2))) (local.get $dx))
            (i32.store (i32.add (local.get $bases) (i32.shl (local.get $taps) (i32.const 2)))
              (i32.add (local.get $data) (i32.shl (i32.add (i32.mul (local.get $sy) (local.get $width)) (local.get $dx)) (i32.const 2))))
            (local.set $taps (i32.add (local.get $taps) (i32.const 1)))
            (if (i32.gt_s (i32.sub (i32.const 0) (local.get $dx)) (local.get $lo)) (then (local.set $lo (i32.sub (i32.const 0) (local.get $dx)))))
            (if (i32.lt_s (i32.sub (local.get $width) (local.get $dx)) (local.get $hi)) (then (local.set $hi (i32.sub (local.get $width) (local.get $dx)))))))
        (local.set $k (i32.add (local.get $k) (i32.const 1)))
        (br $offsets)))
      (local.set $o (i32.add (local.get $out) (i32.shl (i32.mul (i32.sub (local.get $y) (local.get $y0)) (local.get $width)) (i32.const 2))))
      (local.set $x (i32.const 0))
      (block $columnsDone (loop $columns
        (br_if $columnsDone (i32.ge_s (local.get $x) (local.get $width)))
        (local.set $x4 (i32.shl (local.get $x) (i32.const 2)))
        (if (i32.and (i32.ge_s (local.get $x) (local.get $lo)) (i32.lt_s (i32.add (local.get $x) (i32.const 1)) (local.get $hi)))
          (then
            ;; Two columns, every offset inside.
            (local.set $s (f64x2.splat (f64.const 0)))
            (local.set $k (i32.const 0))
            (block $pairDone (loop $pair
              (br_if $pairDone (i32.ge_s (local.get $k) (local.get $taps)))
              (local.set $s (f64x2.add (local.get $s) (f64x2.promote_low_f32x4 (v128.load64_zero
                (i32.add (i32.load (i32.add (local.get $bases) (i32.shl (local.get $k) (i32.const 2)))) (local.get $x4))))))
              (local.set $k (i32.add (local.get $k) (i32.const 1)))
              (br $pair)))
            (v128.store64_lane 0 (i32.add (local.get $o) (local.get $x4))
              (f32x4.demote_f64x2_zero (f64x2.mul (local.get $s) (f64x2.splat (local.get $scale)))))
            (local.set $x (i32.add (local.get $x) (i32.const 2))))
          (else
            ;; One column near an edge: only the offsets that land inside.
            (local.set $sum (f64.const 0))
            (local.set $k (i32.const 0))
            (block $edgeDone (loop $edge
              (br_if $edgeDone (i32.ge_s (local.get $k) (local.get $taps)))
              (local.set $sx (i32.add (local.get $x) (i32.load (i32.add (local.get $shifts) (i32.shl (local.get $k) (i32.const 2))))))
              (if (i32.and (i32.ge_s (local.get $sx) (i32.const 0)) (i32.lt_s (local.get $sx) (local.get $width)))
                (then (local.set $sum (f64.add (local.get $sum) (f64.promote_f32 (f32.load
                  (i32.add (i32.load (i32.add (local.get $bases) (i32.shl (local.get $k) (i32.const 2)))) (local.get $x4))))))))
              (local.set $k (i32.add (local.get $k) (i32.const 1)))
              (br $edge)))
            (f32.store (i32.add (local.get $o) (local.get $x4)) (f32.demote_f64 (f64.mul (local.get $sum) (local.get $scale))))
            (local.set $x (i32.add (local.get $x) (i32.const 1)))))
        (br $columns)))
      (local.set $y (i32.add (local.get $y) (i32.const 1)))
      (br $rows))))

  ;; A coarse row interpolated across to n fine samples, in float64: out[x] = row[i0]·(1 − t) +
  ;; row[i1]·t, with each sample's i0, i1 (i32) and t (f64) from the tap arrays.
  (func (export "acrossRow") (param $row i32) (param $i0 i32) (param $i1 i32) (param $t i32) (param $out i32) (param $n i32)
    (local $x i32) (local $tx f64)
    (block $done (loop $samples
      (br_if $done (i32.ge_u (local.get $x) (local.get $n)))
      (local.set $tx (f64.load (i32.add (local.get $t) (i32.shl (local.get $x) (i32.const 3)))))
      (f64.store (i32.add (local.get $out) (i32.shl (local.get $x) (i32.const 3)))
        (f64.add
          (f64.mul (f64.promote_f32 (f32.load (i32.add (local.get $row) (i32.shl (i32.load (i32.add (local.get $i0) (i32.shl (local.get $x) (i32.const 2)))) (i32.const 2)))))
                   (f64.sub (f64.const 1) (local.get $tx)))
          (f64.mul (f64.promote_f32 (f32.load (i32.add (local.get $row) (i32.shl (i32.load (i32.add (local.get $i1) (i32.shl (local.get $x) (i32.const 2)))) (i32.const 2)))))
                   (local.get $tx))))
      (local.set $x (i32.add (local.get $x) (i32.const 1)))
      (br $samples))))

  ;; A fine row gains share × the blend of two interpolated rows: dst[x] += share·(top[x]·(1 − t)
  ;; + bottom[x]·t), dst f32, top and bottom f64; two samples at a time.
  (func (export "blendRow") (param $dst i32) (param $top i32) (param $bottom i32) (param $n i32) (param $share f64) (param $t f64)
    (local $x i32) (local $pairs i32) (local $shareV v128) (local $tV v128) (local $uV v128)
    (local.set $pairs (i32.and (local.get $n) (i32.const -2)))
    (local.set $shareV (f64x2.splat (local.get $share)))
    (local.set $tV (f64x2.splat (local.get $t)))
    (local.set $uV (f64x2.splat (f64.sub (f64.const 1) (local.get $t))))
    (block $pairsDone (loop $twos
      (br_if $pairsDone (i32.ge_u (local.get $x) (local.get $pairs)))
      (v128.store64_lane 0 (i32.add (local.get $dst) (i32.shl (local.get $x) (i32.const 2)))
        (f32x4.demote_f64x2_zero
          (f64x2.add
            (f64x2.promote_low_f32x4 (v128.load64_zero (i32.add (local.get $dst) (i32.shl (local.get $x) (i32.const 2)))))
            (f64x2.mul (local.get $shareV)
              (f64x2.add
                (f64x2.mul (v128.load (i32.add (local.get $top) (i32.shl (local.get $x) (i32.const 3)))) (local.get $uV))
                (f64x2.mul (v128.load (i32.add (local.get $bottom) (i32.shl (local.get $x) (i32.const 3)))) (local.get $tV)))))))
      (local.set $x (i32.add (local.get $x) (i32.const 2)))
      (br $twos)))
    (if (i32.lt_u (local.get $pairs) (local.get $n))
      (then
        (f32.store (i32.add (local.get $dst) (i32.shl (local.get $x) (i32.const 2)))
          (f32.demote_f64
            (f64.add
              (f64.promote_f32 (f32.load (i32.add (local.get $dst) (i32.shl (local.get $x) (i32.const 2)))))
              (f64.mul (local.get $share)
                (f64.add
                  (f64.mul (f64.load (i32.add (local.get $top) (i32.shl (local.get $x) (i32.const 3)))) (f64.sub (f64.const 1) (local.get $t)))
                  (f64.mul (f64.load (i32.add (local.get $bottom) (i32.shl (local.get $x) (i32.const 3)))) (local.get $t))))))))))

  ;; out[i] = share · in[i] for n float32s (the float64 product rounded to float32, as glow.ts
  ;; scaleInto stores it), four at a time; out may be in.
  (func (export "scale") (param $in i32) (param $out i32) (param $n i32) (param $share f64)
    (local $i i32) (local $quads i32) (local $s v128) (local $v v128)
    (local.set $s (f64x2.splat (local.get $share)))
    (local.set $quads (i32.and (local.get $n) (i32.const -4)))
    (block $quadsDone (loop $fours
      (br_if $quadsDone (i32.ge_u (local.get $i) (local.get $quads)))
      (local.set $v (v128.load (i32.add (local.get $in) (i32.shl (local.get $i) (i32.const 2)))))
      (v128.store (i32.add (local.get $out) (i32.shl (local.get $i) (i32.const 2)))
        (i8x16.shuffle 0 1 2 3 4 5 6 7 16 17 18 19 20 21 22 23
          (f32x4.demote_f64x2_zero (f64x2.mul (local.get $s) (f64x2.promote_low_f32x4 (local.get $v))))
          (f32x4.demote_f64x2_zero (f64x2.mul (local.get $s) (f64x2.promote_low_f32x4
            (i8x16.shuffle 8 9 10 11 12 13 14 15 0 1 2 3 4 5 6 7 (local.get $v) (local.get $v)))))))
      (local.set $i (i32.add (local.get $i) (i32.const 4)))
      (br $fours)))
    (block $tailDone (loop $ones
      (br_if $tailDone (i32.ge_u (local.get $i) (local.get $n)))
      (f32.store (i32.add (local.get $out) (i32.shl (local.get $i) (i32.const 2)))
        (f32.demote_f64 (f64.mul (local.get $share) (f64.promote_f32 (f32.load (i32.add (local.get $in) (i32.shl (local.get $i) (i32.const 2))))))))
      (local.set $i (i32.add (local.get $i) (i32.const 1)))
      (br $ones))))
)
