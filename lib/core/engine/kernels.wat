;; The engine's WebAssembly SIMD kernels (wasm-kernels.ts loads them; each has a JavaScript
;; twin that runs when WebAssembly is not available and gives the same bits).
;;
;; Rebuild after editing: `npm run build:wasm` (writes kernels-wasm.ts);
;; tests/unit/engine/wasm-kernels.test.ts checks that the committed bytes match this text.
(module
  (memory (export "memory") 1)

  ;; The Gaussian copula's affine product (correlation.ts, CopulaGroupSampler): for one member,
  ;; acc[t] = a + sum_g c_g z_{j_g}[t] over a block of trials, in f64x2 lanes (two trials each),
  ;; eight trials per pass so the four accumulators stay in registers across all coefficients.
  ;; Bit-identical to the JavaScript loop: per trial the same operations in the same order,
  ;; no fused multiply-add. Coefficients are taken four at a time,
  ;; acc + (((c0 z0 + c1 z1) + c2 z2) + c3 z3), then one at a time, acc + c z.

  ;; acc, z blocks: byte addresses; coef: f64 per coefficient; off: i32 byte address of the
  ;; z block of each coefficient. count is rounded up to a multiple of 8 trials: every block
  ;; holds at least that many values (the extra lanes are computed and not read).
  (func (export "affine")
    (param $acc i32) (param $a f64) (param $coef i32) (param $off i32) (param $terms i32) (param $count i32)
    (local $t i32) (local $end i32) (local $g i32) (local $g4 i32) (local $cp i32) (local $op i32) (local $p i32)
    (local $v0 v128) (local $v1 v128) (local $v2 v128) (local $v3 v128)
    (local $s0 v128) (local $s1 v128) (local $s2 v128) (local $s3 v128)
    (local $c v128)
    (local.set $end
      (i32.shl (i32.and (i32.add (local.get $count) (i32.const 7)) (i32.const -8)) (i32.const 3)))
    (local.set $g4 (i32.and (local.get $terms) (i32.const -4)))
    (block $trials_done
      (loop $trials
        (br_if $trials_done (i32.ge_u (local.get $t) (local.get $end)))
        (local.set $v0 (f64x2.splat (local.get $a)))
        (local.set $v1 (local.get $v0))
        (local.set $v2 (local.get $v0))
        (local.set $v3 (local.get $v0))
        (local.set $cp (local.get $coef))
        (local.set $op (local.get $off))
        (local.set $g (i32.const 0))
        (block $groups_done
          (loop $groups
            (br_if $groups_done (i32.ge_u (local.get $g) (local.get $g4)))
            ;; s = c0 z0
            (local.set $c (v128.load64_splat (local.get $cp)))
            (local.set $p (i32.add (i32.load (local.get $op)) (local.get $t)))
            (local.set $s0 (f64x2.mul (local.get $c) (v128.load (local.get $p))))
            (local.set $s1 (f64x2.mul (local.get $c) (v128.load offset=16 (local.get $p))))
            (local.set $s2 (f64x2.mul (local.get $c) (v128.load offset=32 (local.get $p))))
            (local.set $s3 (f64x2.mul (local.get $c) (v128.load offset=48 (local.get $p))))
            ;; s = s + c1 z1
            (local.set $c (v128.load64_splat offset=8 (local.get $cp)))
            (local.set $p (i32.add (i32.load offset=4 (local.get $op)) (local.get $t)))
            (local.set $s0 (f64x2.add (local.get $s0) (f64x2.mul (local.get $c) (v128.load (local.get $p)))))
            (local.set $s1 (f64x2.add (local.get $s1) (f64x2.mul (local.get $c) (v128.load offset=16 (local.get $p)))))
            (local.set $s2 (f64x2.add (local.get $s2) (f64x2.mul (local.get $c) (v128.load offset=32 (local.get $p)))))
            (local.set $s3 (f64x2.add (local.get $s3) (f64x2.mul (local.get $c) (v128.load offset=48 (local.get $p)))))
            ;; s = s + c2 z2
            (local.set $c (v128.load64_splat offset=16 (local.get $cp)))
            (local.set $p (i32.add (i32.load offset=8 (local.get $op)) (local.get $t)))
            (local.set $s0 (f64x2.add (local.get $s0) (f64x2.mul (local.get $c) (v128.load (local.get $p)))))
            (local.set $s1 (f64x2.add (local.get $s1) (f64x2.mul (local.get $c) (v128.load offset=16 (local.get $p)))))
            (local.set $s2 (f64x2.add (local.get $s2) (f64x2.mul (local.get $c) (v128.load offset=32 (local.get $p)))))
            (local.set $s3 (f64x2.add (local.get $s3) (f64x2.mul (local.get $c) (v128.load offset=48 (local.get $p)))))
            ;; s = s + c3 z3
            (local.set $c (v128.load64_splat offset=24 (local.get $cp)))
            (local.set $p (i32.add (i32.load offset=12 (local.get $op)) (local.get $t)))
            (local.set $s0 (f64x2.add (local.get $s0) (f64x2.mul (local.get $c) (v128.load (local.get $p)))))
            (local.set $s1 (f64x2.add (local.get $s1) (f64x2.mul (local.get $c) (v128.load offset=16 (local.get $p)))))
            (local.set $s2 (f64x2.add (local.get $s2) (f64x2.mul (local.get $c) (v128.load offset=32 (local.get $p)))))
            (local.set $s3 (f64x2.add (local.get $s3) (f64x2.mul (local.get $c) (v128.load offset=48 (local.get $p)))))
            ;; acc = acc + s
            (local.set $v0 (f64x2.add (local.get $v0) (local.get $s0)))
            (local.set $v1 (f64x2.add (local.get $v1) (local.get $s1)))
            (local.set $v2 (f64x2.add (local.get $v2) (local.get $s2)))
            (local.set $v3 (f64x2.add (local.get $v3) (local.get $s3)))
            (local.set $cp (i32.add (local.get $cp) (i32.const 32)))
            (local.set $op (i32.add (local.get $op) (i32.const 16)))
            (local.set $g (i32.add (local.get $g) (i32.const 4)))
            (br $groups)))
        (block $singles_done
          (loop $singles
            (br_if $singles_done (i32.ge_u (local.get $g) (local.get $terms)))
            ;; acc = acc + c z
            (local.set $c (v128.load64_splat (local.get $cp)))
            (local.set $p (i32.add (i32.load (local.get $op)) (local.get $t)))
            (local.set $v0 (f64x2.add (local.get $v0) (f64x2.mul (local.get $c) (v128.load (local.get $p)))))
            (local.set $v1 (f64x2.add (local.get $v1) (f64x2.mul (local.get $c) (v128.load offset=16 (local.get $p)))))
            (local.set $v2 (f64x2.add (local.get $v2) (f64x2.mul (local.get $c) (v128.load offset=32 (local.get $p)))))
            (local.set $v3 (f64x2.add (local.get $v3) (f64x2.mul (local.get $c) (v128.load offset=48 (local.get $p)))))
            (local.set $cp (i32.add (local.get $cp) (i32.const 8)))
            (local.set $op (i32.add (local.get $op) (i32.const 4)))
            (local.set $g (i32.add (local.get $g) (i32.const 1)))
            (br $singles)))
        (local.set $p (i32.add (local.get $acc) (local.get $t)))
        (v128.store (local.get $p) (local.get $v0))
        (v128.store offset=16 (local.get $p) (local.get $v1))
        (v128.store offset=32 (local.get $p) (local.get $v2))
        (v128.store offset=48 (local.get $p) (local.get $v3))
        (local.set $t (i32.add (local.get $t) (i32.const 64)))
        (br $trials))))

  ;; Brent's xor4096 recurrence as seedrandom 3.0.5 steps it (rng.ts, xorgenFill), four steps
  ;; per i32x4 operation. With the state laid out in time order, L[0..128) oldest first, step k
  ;; computes L[128 + k] from L[k] and L[k + 33] (written 128 and 95 steps before), so four
  ;; consecutive steps never depend on each other. out[k] = L[128 + k] + (w_k ^ (w_k >>> 16))
  ;; with the Weyl sequence w_k = w + (k + 1) 0x61c88647. n is a multiple of 8.
  (func (export "xorgen") (param $state i32) (param $out i32) (param $n i32) (param $w i32)
    (local $k i32) (local $p i32) (local $q i32)
    (local $v v128) (local $t v128) (local $wv v128) (local $step v128)
    (local $v2 v128) (local $t2 v128) (local $wv2 v128)
    ;; w_1 .. w_4, and the step of four.
    (local.set $wv
      (i32x4.add (i32x4.splat (local.get $w)) (v128.const i32x4 0x61c88647 0xc3910c8e 0x255992d5 0x8722191c)))
    (local.set $step (i32x4.splat (i32.const 0x8722191c)))
    (block $done
      (loop $steps
        (br_if $done (i32.ge_u (local.get $k) (local.get $n)))
        (local.set $p (i32.add (local.get $state) (i32.shl (local.get $k) (i32.const 2))))
        (local.set $q (i32.add (local.get $out) (i32.shl (local.get $k) (i32.const 2))))
        (local.set $wv2 (i32x4.add (local.get $wv) (local.get $step)))
        ;; v = L[k + 33], t = L[k]; v ^= v << 13; t ^= t << 17; v ^= v >>> 15; t ^= t >>> 12; v ^= t
        (local.set $v (v128.load offset=132 (local.get $p)))
        (local.set $t (v128.load (local.get $p)))
        (local.set $v2 (v128.load offset=148 (local.get $p)))
        (local.set $t2 (v128.load offset=16 (local.get $p)))
        (local.set $v (v128.xor (local.get $v) (i32x4.shl (local.get $v) (i32.const 13))))
        (local.set $v2 (v128.xor (local.get $v2) (i32x4.shl (local.get $v2) (i32.const 13))))
        (local.set $t (v128.xor (local.get $t) (i32x4.shl (local.get $t) (i32.const 17))))
        (local.set $t2 (v128.xor (local.get $t2) (i32x4.shl (local.get $t2) (i32.const 17))))
        (local.set $v (v128.xor (local.get $v) (i32x4.shr_u (local.get $v) (i32.const 15))))
        (local.set $v2 (v128.xor (local.get $v2) (i32x4.shr_u (local.get $v2) (i32.const 15))))
        (local.set $t (v128.xor (local.get $t) (i32x4.shr_u (local.get $t) (i32.const 12))))
        (local.set $t2 (v128.xor (local.get $t2) (i32x4.shr_u (local.get $t2) (i32.const 12))))
        (local.set $v (v128.xor (local.get $v) (local.get $t)))
        (local.set $v2 (v128.xor (local.get $v2) (local.get $t2)))
        (v128.store offset=512 (local.get $p) (local.get $v))
        (v128.store offset=528 (local.get $p) (local.get $v2))
        (v128.store (local.get $q)
          (i32x4.add (local.get $v) (v128.xor (local.get $wv) (i32x4.shr_u (local.get $wv) (i32.const 16)))))
        (v128.store offset=16 (local.get $q)
          (i32x4.add (local.get $v2) (v128.xor (local.get $wv2) (i32x4.shr_u (local.get $wv2) (i32.const 16)))))
        (local.set $wv (i32x4.add (local.get $wv2) (local.get $step)))
        (local.set $k (i32.add (local.get $k) (i32.const 8)))
        (br $steps))))

  ;; The ziggurat's fast path (normal-gen.ts, ZigguratGenerator.fill) over n buffered 32-bit
  ;; draws u: layer i = u & 255, position j = u >>> 9, x = j w[i] with the sign of bit 8
  ;; (flipping the sign bit is exact negation); accepted while j < k[i]. Writes the accepted
  ;; values to out and returns how many draws were accepted before the first that was not
  ;; (n when all were): the caller takes that draw through the slow path in JavaScript.
  (func (export "zigguratFast") (param $ints i32) (param $n i32) (param $out i32) (param $tw i32) (param $tk i32) (result i32)
    (local $k i32) (local $u i32) (local $i i32) (local $j i32)
    (block $done
      (loop $draws
        (br_if $done (i32.ge_u (local.get $k) (local.get $n)))
        (local.set $u (i32.load (i32.add (local.get $ints) (i32.shl (local.get $k) (i32.const 2)))))
        (local.set $i (i32.and (local.get $u) (i32.const 255)))
        (local.set $j (i32.shr_u (local.get $u) (i32.const 9)))
        (br_if $done
          (i32.ge_u (local.get $j) (i32.load (i32.add (local.get $tk) (i32.shl (local.get $i) (i32.const 2))))))
        (f64.store
          (i32.add (local.get $out) (i32.shl (local.get $k) (i32.const 3)))
          (f64.reinterpret_i64
            (i64.xor
              (i64.reinterpret_f64
                (f64.mul
                  (f64.convert_i32_u (local.get $j))
                  (f64.load (i32.add (local.get $tw) (i32.shl (local.get $i) (i32.const 3))))))
              (i64.shl (i64.extend_i32_u (i32.and (local.get $u) (i32.const 256))) (i64.const 55)))))
        (local.set $k (i32.add (local.get $k) (i32.const 1)))
        (br $draws)))
    (local.get $k))

  ;; The two sums of the corrected two-pass moments (stats.ts, twoPassMoments) over n values at x:
  ;; element k goes to partial sum k mod 8 (lanes of four f64x2 accumulators), the last n mod 8
  ;; to a ninth summed one after another; the partials combine as
  ;; ((v0 + v1) + (v2 + v3)), then lane 0 + lane 1, then + the ninth.
  ;; sum: returns the sum of the values.
  (func (export "sum") (param $x i32) (param $n i32) (result f64)
    (local $p i32) (local $end i32) (local $tail f64)
    (local $v0 v128) (local $v1 v128) (local $v2 v128) (local $v3 v128)
    (local.set $end (i32.add (local.get $x) (i32.shl (i32.and (local.get $n) (i32.const -8)) (i32.const 3))))
    (local.set $p (local.get $x))
    (block $done
      (loop $values
        (br_if $done (i32.ge_u (local.get $p) (local.get $end)))
        (local.set $v0 (f64x2.add (local.get $v0) (v128.load (local.get $p))))
        (local.set $v1 (f64x2.add (local.get $v1) (v128.load offset=16 (local.get $p))))
        (local.set $v2 (f64x2.add (local.get $v2) (v128.load offset=32 (local.get $p))))
        (local.set $v3 (f64x2.add (local.get $v3) (v128.load offset=48 (local.get $p))))
        (local.set $p (i32.add (local.get $p) (i32.const 64)))
        (br $values)))
    (local.set $end (i32.add (local.get $x) (i32.shl (local.get $n) (i32.const 3))))
    (block $done
      (loop $rest
        (br_if $done (i32.ge_u (local.get $p) (local.get $end)))
        (local.set $tail (f64.add (local.get $tail) (f64.load (local.get $p))))
        (local.set $p (i32.add (local.get $p) (i32.const 8)))
        (br $rest)))
    (local.set $v0 (f64x2.add (f64x2.add (local.get $v0) (local.get $v1)) (f64x2.add (local.get $v2) (local.get $v3))))
    (f64.add
      (f64.add (f64x2.extract_lane 0 (local.get $v0)) (f64x2.extract_lane 1 (local.get $v0)))
      (local.get $tail)))

  ;; deviations: with d = x - mean, stores the sum of d (the correction) at out and returns the
  ;; sum of d * d, both in the order described above.
  (func (export "deviations") (param $x i32) (param $n i32) (param $mean f64) (param $out i32) (result f64)
    (local $p i32) (local $end i32) (local $d f64) (local $tq f64) (local $tc f64)
    (local $m v128) (local $e v128)
    (local $q0 v128) (local $q1 v128) (local $q2 v128) (local $q3 v128)
    (local $c0 v128) (local $c1 v128) (local $c2 v128) (local $c3 v128)
    (local.set $m (f64x2.splat (local.get $mean)))
    (local.set $end (i32.add (local.get $x) (i32.shl (i32.and (local.get $n) (i32.const -8)) (i32.const 3))))
    (local.set $p (local.get $x))
    (block $done
      (loop $values
        (br_if $done (i32.ge_u (local.get $p) (local.get $end)))
        (local.set $e (f64x2.sub (v128.load (local.get $p)) (local.get $m)))
        (local.set $q0 (f64x2.add (local.get $q0) (f64x2.mul (local.get $e) (local.get $e))))
        (local.set $c0 (f64x2.add (local.get $c0) (local.get $e)))
        (local.set $e (f64x2.sub (v128.load offset=16 (local.get $p)) (local.get $m)))
        (local.set $q1 (f64x2.add (local.get $q1) (f64x2.mul (local.get $e) (local.get $e))))
        (local.set $c1 (f64x2.add (local.get $c1) (local.get $e)))
        (local.set $e (f64x2.sub (v128.load offset=32 (local.get $p)) (local.get $m)))
        (local.set $q2 (f64x2.add (local.get $q2) (f64x2.mul (local.get $e) (local.get $e))))
        (local.set $c2 (f64x2.add (local.get $c2) (local.get $e)))
        (local.set $e (f64x2.sub (v128.load offset=48 (local.get $p)) (local.get $m)))
        (local.set $q3 (f64x2.add (local.get $q3) (f64x2.mul (local.get $e) (local.get $e))))
        (local.set $c3 (f64x2.add (local.get $c3) (local.get $e)))
        (local.set $p (i32.add (local.get $p) (i32.const 64)))
        (br $values)))
    (local.set $end (i32.add (local.get $x) (i32.shl (local.get $n) (i32.const 3))))
    (block $done
      (loop $rest
        (br_if $done (i32.ge_u (local.get $p) (local.get $end)))
        (local.set $d (f64.sub (f64.load (local.get $p)) (local.get $mean)))
        (local.set $tq (f64.add (local.get $tq) (f64.mul (local.get $d) (local.get $d))))
        (local.set $tc (f64.add (local.get $tc) (local.get $d)))
        (local.set $p (i32.add (local.get $p) (i32.const 8)))
        (br $rest)))
    (local.set $c0 (f64x2.add (f64x2.add (local.get $c0) (local.get $c1)) (f64x2.add (local.get $c2) (local.get $c3))))
    (f64.store (local.get $out)
      (f64.add
        (f64.add (f64x2.extract_lane 0 (local.get $c0)) (f64x2.extract_lane 1 (local.get $c0)))
        (local.get $tc)))
    (local.set $q0 (f64x2.add (f64x2.add (local.get $q0) (local.get $q1)) (f64x2.add (local.get $q2) (local.get $q3))))
    (f64.add
      (f64.add (f64x2.extract_lane 0 (local.get $q0)) (f64x2.extract_lane 1 (local.get $q0)))
      (local.get $tq)))
)
