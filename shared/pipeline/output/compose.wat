;; The composer's per-pixel loops (compose.ts) as WebAssembly: a panel row's profile and a glow
;; row interpolated across to output width, the direct light of rows seen through many panel
;; rows, and an output row's light through the pixel coder's table. Each
;; pixel goes through the same operations in the same order as the TypeScript loops (float32
;; values promoted to float64, float32 sums rounded where those round, no fused multiply-add),
;; so the two give the same bits (compose-kernels.spec.ts). Compiled by
;; `npx tsx scripts/gen-wasm.ts` into compose-wasm.ts.
(module
  (memory (export "memory") 1)

  ;; out[x] = glow[i0]·t0 + glow[i1]·t1 in float64, for the n output columns: `taps` holds each
  ;; column's two sample indices (i32) and `weights` its two weights (f32), as glowTaps makes them.
  (func (export "glowRowAcross") (param $glow i32) (param $taps i32) (param $weights i32) (param $out i32) (param $n i32)
    (local $x i32) (local $t i32)
    (block $done (loop $columns
      (br_if $done (i32.ge_u (local.get $x) (local.get $n)))
      (local.set $t (i32.shl (local.get $x) (i32.const 3)))
      (f64.store (i32.add (local.get $out) (local.get $t))
        (f64.add
          (f64.mul
            (f64.promote_f32 (f32.load (i32.add (local.get $glow) (i32.shl (i32.load (i32.add (local.get $taps) (local.get $t))) (i32.const 2)))))
            (f64.promote_f32 (f32.load (i32.add (local.get $weights) (local.get $t)))))
          (f64.mul
            (f64.promote_f32 (f32.load (i32.add (local.get $glow) (i32.shl (i32.load offset=4 (i32.add (local.get $taps) (local.get $t))) (i32.const 2)))))
            (f64.promote_f32 (f32.load offset=4 (i32.add (local.get $weights) (local.get $t)))))))
      (local.set $x (i32.add (local.get $x) (i32.const 1)))
      (br $columns))))

  ;; A panel row's light across the n output columns: out[x] = Σ_j row[index[x·stride + j]] ·
  ;; weight[x·stride + j], summed in float64 from zero in tap order, rounded to float32.
  (func (export "rowProfile") (param $row i32) (param $index i32) (param $weight i32) (param $stride i32) (param $out i32) (param $n i32)
    (local $x i32) (local $j i32) (local $t i32) (local $s f64)
    (block $done (loop $columns
      (br_if $done (i32.ge_u (local.get $x) (local.get $n)))
      (local.set $s (f64.const 0))
      (local.set $j (i32.const 0))
      (block $tapsDone (loop $taps
        (br_if $tapsDone (i32.ge_u (local.get $j) (local.get $stride)))
        (local.set $t (i32.shl (i32.add (i32.mul (local.get $x) (local.get $stride)) (local.get $j)) (i32.const 2)))
        (local.set $s (f64.add (local.get $s)
          (f64.mul
            (f64.promote_f32 (f32.load (i32.add (local.get $row) (i32.shl (i32.load (i32.add (local.get $index) (local.get $t))) (i32.const 2)))))
            (f64.promote_f32 (f32.load (i32.add (local.get $weight) (local.get $t)))))))
        (local.set $j (i32.add (local.get $j) (i32.const 1)))
        (br $taps)))
      (f32.store (i32.add (local.get $out) (i32.shl (local.get $x) (i32.const 2))) (f32.demote_f64 (local.get $s)))
      (local.set $x (i32.add (local.get $x) (i32.const 1)))
      (br $columns))))

  ;; The direct light of an output row that sees `count` (> 2) panel rows, into `direct`: their
  ;; profiles (byte addresses in `rows`, i32) times their weights (`weights`, f64), in float32
  ;; steps — w0·p0 + w1·p1, then + wk·pk for each further row — as summing row by row into a
  ;; Float32Array does.
  (func (export "sumProfiles") (param $direct i32) (param $n i32) (param $count i32) (param $weights i32) (param $rows i32)
    (local $x i32) (local $k i32) (local $o i32) (local $d f32)
    (block $done (loop $columns
      (br_if $done (i32.ge_u (local.get $x) (local.get $n)))
      (local.set $o (i32.shl (local.get $x) (i32.const 2)))
      (local.set $d (f32.demote_f64 (f64.add
        (f64.promote_f32 (f32.demote_f64 (f64.mul (f64.load (local.get $weights))
          (f64.promote_f32 (f32.load (i32.add (i32.load (local.get $rows)) (local.get $o)))))))
        (f64.mul (f64.load offset=8 (local.get $weights))
          (f64.promote_f32 (f32.load (i32.add (i32.load offset=4 (local.get $rows)) (local.get $o))))))))
      (local.set $k (i32.const 2))
      (block $rowsDone (loop $more
        (br_if $rowsDone (i32.ge_u (local.get $k) (local.get $count)))
        (local.set $d (f32.demote_f64 (f64.add (f64.promote_f32 (local.get $d))
          (f64.mul (f64.load (i32.add (local.get $weights) (i32.shl (local.get $k) (i32.const 3))))
            (f64.promote_f32 (f32.load (i32.add (i32.load (i32.add (local.get $rows) (i32.shl (local.get $k) (i32.const 2)))) (local.get $o))))))))
        (local.set $k (i32.add (local.get $k) (i32.const 1)))
        (br $more)))
      (f32.store (i32.add (local.get $direct) (local.get $o)) (local.get $d))
      (local.set $x (i32.add (local.get $x) (i32.const 1)))
      (br $columns))))

  ;; One output row: the direct light d from `taps` profile rows (0; w0·p0; w0·p0 + w1·p1 in
  ;; float32 steps; more than two already summed into p0), plus the glow, is the relative
  ;; luminance v = share·d + (h0·ty0 + h1·ty1), and its word from the pixel coder's table
  ;; (PixelCoder.word): final when its alpha is 255 (negative as i32), else stepped up ($refine).
  ;; v = 0 is the word `zero`, a finite v from vMax on the word `top`; any other v (negative, NaN,
  ;; infinite) goes to the slow list (its column and v) for the pixel coder. Returns the length of
  ;; that list. Two pixels at a time: v in the two lanes of an f64x2 (the same IEEE operations lane
  ;; by lane, float32 roundings by demote and promote), then each lane through the table. An odd
  ;; last pixel reads one value past its rows (every row buffer has others after it in memory) and
  ;; stores nothing of that lane.
  (func (export "encodeRow")
        (param $words i32) (param $n i32) (param $taps i32)
        (param $w0 f64) (param $p0 i32) (param $w1 f64) (param $p1 i32) (param $share f64)
        (param $h0 i32) (param $ty0 f64) (param $h1 i32) (param $ty1 f64)
        (param $table i32) (param $perV f64) (param $vMax f64) (param $zero i32) (param $top i32) (param $thresholds i32)
        (param $slowX i32) (param $slowV i32) (result i32)
    (local $x i32) (local $slow i32) (local $v f64) (local $word i32) (local $o4 i32) (local $o8 i32)
    (local $d v128) (local $lanes v128) (local $W0 v128) (local $W1 v128) (local $S v128) (local $T0 v128) (local $T1 v128)
    (local.set $W0 (f64x2.splat (local.get $w0)))
    (local.set $W1 (f64x2.splat (local.get $w1)))
    (local.set $S (f64x2.splat (local.get $share)))
    (local.set $T0 (f64x2.splat (local.get $ty0)))
    (local.set $T1 (f64x2.splat (local.get $ty1)))
    (block $done (loop $pairs
      (br_if $done (i32.ge_u (local.get $x) (local.get $n)))
      (local.set $o4 (i32.shl (local.get $x) (i32.const 2)))
      (local.set $o8 (i32.shl (local.get $x) (i32.const 3)))
      (block $direct
        (block $many (block $two (block $one (block $none
          (br_table $none $one $two $many (local.get $taps)))
          (local.set $d (v128.const f64x2 0 0))
          (br $direct))
          (local.set $d (f64x2.promote_low_f32x4 (f32x4.demote_f64x2_zero
            (f64x2.mul (local.get $W0) (f64x2.promote_low_f32x4 (v128.load64_zero (i32.add (local.get $p0) (local.get $o4))))))))
          (br $direct))
          (local.set $d (f64x2.promote_low_f32x4 (f32x4.demote_f64x2_zero
            (f64x2.add
              (f64x2.promote_low_f32x4 (f32x4.demote_f64x2_zero
                (f64x2.mul (local.get $W0) (f64x2.promote_low_f32x4 (v128.load64_zero (i32.add (local.get $p0) (local.get $o4)))))))
              (f64x2.mul (local.get $W1) (f64x2.promote_low_f32x4 (v128.load64_zero (i32.add (local.get $p1) (local.get $o4)))))))))
          (br $direct))
        (local.set $d (f64x2.promote_low_f32x4 (v128.load64_zero (i32.add (local.get $p0) (local.get $o4))))))
      (local.set $lanes
        (f64x2.add (f64x2.mul (local.get $S) (local.get $d))
                   (f64x2.add (f64x2.mul (v128.load (i32.add (local.get $h0) (local.get $o8))) (local.get $T0))
                              (f64x2.mul (v128.load (i32.add (local.get $h1) (local.get $o8))) (local.get $T1)))))
      (local.set $v (f64x2.extract_lane 0 (local.get $lanes)))
      (local.set $word (i32.const 0))
      (if (i32.and (f64.gt (local.get $v) (f64.const 0)) (f64.lt (local.get $v) (local.get $vMax)))
        (then (local.set $word (i32.load (i32.add (local.get $table)
          (i32.shl (i32.trunc_sat_f64_s (f64.mul (local.get $v) (local.get $perV))) (i32.const 2)))))))
      (if (i32.ge_s (local.get $word) (i32.const 0))
        (then (local.set $word (call $rare (local.get $v) (local.get $word) (local.get $vMax) (local.get $zero) (local.get $top) (local.get $thresholds)))))
      (if (local.get $word)
        (then (i32.store (i32.add (local.get $words) (local.get $o4)) (local.get $word)))
        (else
          (i32.store (i32.add (local.get $slowX) (i32.shl (local.get $slow) (i32.const 2))) (local.get $x))
          (f64.store (i32.add (local.get $slowV) (i32.shl (local.get $slow) (i32.const 3))) (local.get $v))
          (local.set $slow (i32.add (local.get $slow) (i32.const 1)))))
      (local.set $x (i32.add (local.get $x) (i32.const 1)))
      (br_if $done (i32.ge_u (local.get $x) (local.get $n)))
      (local.set $o4 (i32.add (local.get $o4) (i32.const 4)))
      (local.set $v (f64x2.extract_lane 1 (local.get $lanes)))
      (local.set $word (i32.const 0))
      (if (i32.and (f64.gt (local.get $v) (f64.const 0)) (f64.lt (local.get $v) (local.get $vMax)))
        (then (local.set $word (i32.load (i32.add (local.get $table)
          (i32.shl (i32.trunc_sat_f64_s (f64.mul (local.get $v) (local.get $perV))) (i32.const 2)))))))
      (if (i32.ge_s (local.get $word) (i32.const 0))
        (then (local.set $word (call $rare (local.get $v) (local.get $word) (local.get $vMax) (local.get $zero) (local.get $top) (local.get $thresholds)))))
      (if (local.get $word)
        (then (i32.store (i32.add (local.get $words) (local.get $o4)) (local.get $word)))
        (else
          (i32.store (i32.add (local.get $slowX) (i32.shl (local.get $slow) (i32.const 2))) (local.get $x))
          (f64.store (i32.add (local.get $slowV) (i32.shl (local.get $slow) (i32.const 3))) (local.get $v))
          (local.set $slow (i32.add (local.get $slow) (i32.const 1)))))
      (local.set $x (i32.add (local.get $x) (i32.const 1)))
      (br $pairs)))
    (local.get $slow))

  ;; The word for a v the table does not give outright: inside (0, vMax), the lower bound `word`
  ;; (alpha 0) with each channel's code stepped up past the thresholds v has reached; v = 0 and a
  ;; finite v from vMax on, the constant words; otherwise 0 (no word: alpha is never 0).
  (func $rare (param $v f64) (param $word i32) (param $vMax f64) (param $zero i32) (param $top i32) (param $thresholds i32) (result i32)
    (if (i32.and (f64.gt (local.get $v) (f64.const 0)) (f64.lt (local.get $v) (local.get $vMax)))
      (then (return (i32.or
        (i32.or (call $step (local.get $v) (i32.and (local.get $word) (i32.const 255)) (local.get $thresholds))
                (i32.shl (call $step (local.get $v) (i32.and (i32.shr_u (local.get $word) (i32.const 8)) (i32.const 255))
                                     (i32.add (local.get $thresholds) (i32.const 2056))) (i32.const 8)))
        (i32.or (i32.shl (call $step (local.get $v) (i32.and (i32.shr_u (local.get $word) (i32.const 16)) (i32.const 255))
                                     (i32.add (local.get $thresholds) (i32.const 4112))) (i32.const 16))
                (i32.const 0xff000000))))))
    (if (f64.eq (local.get $v) (f64.const 0)) (then (return (local.get $zero))))
    (if (i32.and (f64.ge (local.get $v) (local.get $vMax)) (f64.lt (local.get $v) (f64.const inf)))
      (then (return (local.get $top))))
    (i32.const 0))

  ;; One channel's code c stepped up while c < 255 and v ≥ its threshold c + 1 (257 f64 at `t`).
  (func $step (param $v f64) (param $c i32) (param $t i32) (result i32)
    (block $done (loop $up
      (br_if $done (i32.ge_u (local.get $c) (i32.const 255)))
      (br_if $done (i32.eqz (f64.ge (local.get $v) (f64.load offset=8 (i32.add (local.get $t) (i32.shl (local.get $c) (i32.const 3)))))))
      (local.set $c (i32.add (local.get $c) (i32.const 1)))
      (br $up)))
    (local.get $c))
)
