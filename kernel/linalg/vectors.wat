;; Long vector operations of the Householder QR (_householder.ts) in
;; WebAssembly, two doubles a step (SIMD), on arrays that live in the
;; instance's memory (_wasm_vectors.ts): the source of _vectors_bytes.ts
;; (assembled by kernel/wasm/build.ts; vectors_wasm_test.ts checks they agree).
;;
;; Every result is the JavaScript loop's bit for bit: the same IEEE
;; operations in the same order. `dot` keeps blockedDot's summation exactly
;; (blocks of 256 terms, even terms in lane 0 and odd terms in lane 1 as its
;; two partial sums, an odd last term added to lane 0's sum, each block's
;; lane 0 + lane 1 added to a group, groups of 256 blocks to the total);
;; `reflect` is applyReflector's c ← c − τ·(vᵀc)·v with v(0) = 1 implied;
;; no fused multiply-add anywhere (WebAssembly has none in these operations).
;; Addresses are bytes, lengths are elements.
(module
  (import "env" "memory" (memory 1))

  (func $dot (export "dot") (param $x i32) (param $y i32) (param $len i32) (result f64)
    (local $b i32) (local $end i32) (local $i i32) (local $s v128) (local $s0 f64)
    (local $group f64) (local $total f64) (local $blocks i32) (local $at i32)
    (block $done
      (loop $block
        (br_if $done (i32.ge_u (local.get $b) (local.get $len)))
        (local.set $end (i32.add (local.get $b) (i32.const 256)))
        (if (i32.gt_u (local.get $end) (local.get $len)) (then (local.set $end (local.get $len))))
        (local.set $s (v128.const f64x2 0 0))
        (local.set $i (local.get $b))
        (block $pairsDone
          (loop $pairs
            (br_if $pairsDone (i32.ge_u (i32.add (local.get $i) (i32.const 1)) (local.get $end)))
            (local.set $at (i32.shl (local.get $i) (i32.const 3)))
            (local.set $s (f64x2.add (local.get $s)
              (f64x2.mul
                (v128.load (i32.add (local.get $x) (local.get $at)))
                (v128.load (i32.add (local.get $y) (local.get $at))))))
            (local.set $i (i32.add (local.get $i) (i32.const 2)))
            (br $pairs)))
        (local.set $s0 (f64x2.extract_lane 0 (local.get $s)))
        (if (i32.lt_u (local.get $i) (local.get $end))
          (then
            (local.set $at (i32.shl (local.get $i) (i32.const 3)))
            (local.set $s0 (f64.add (local.get $s0)
              (f64.mul
                (f64.load (i32.add (local.get $x) (local.get $at)))
                (f64.load (i32.add (local.get $y) (local.get $at))))))))
        (local.set $group (f64.add (local.get $group)
          (f64.add (local.get $s0) (f64x2.extract_lane 1 (local.get $s)))))
        (local.set $blocks (i32.add (local.get $blocks) (i32.const 1)))
        (if (i32.eq (local.get $blocks) (i32.const 256))
          (then
            (local.set $total (f64.add (local.get $total) (local.get $group)))
            (local.set $group (f64.const 0))
            (local.set $blocks (i32.const 0))))
        (local.set $b (i32.add (local.get $b) (i32.const 256)))
        (br $block)))
    (f64.add (local.get $total) (local.get $group)))

  ;; c[i] ← c[i] − t·v[i] for i < len.
  (func $axpy (param $t f64) (param $v i32) (param $c i32) (param $len i32)
    (local $i i32) (local $at i32) (local $tt v128)
    (local.set $tt (f64x2.splat (local.get $t)))
    (block $pairsDone
      (loop $pairs
        (br_if $pairsDone (i32.ge_u (i32.add (local.get $i) (i32.const 1)) (local.get $len)))
        (local.set $at (i32.shl (local.get $i) (i32.const 3)))
        (v128.store (i32.add (local.get $c) (local.get $at))
          (f64x2.sub
            (v128.load (i32.add (local.get $c) (local.get $at)))
            (f64x2.mul (local.get $tt) (v128.load (i32.add (local.get $v) (local.get $at))))))
        (local.set $i (i32.add (local.get $i) (i32.const 2)))
        (br $pairs)))
    (if (i32.lt_u (local.get $i) (local.get $len))
      (then
        (local.set $at (i32.shl (local.get $i) (i32.const 3)))
        (f64.store (i32.add (local.get $c) (local.get $at))
          (f64.sub
            (f64.load (i32.add (local.get $c) (local.get $at)))
            (f64.mul (local.get $t) (f64.load (i32.add (local.get $v) (local.get $at)))))))))

  ;; applyReflector: w = c(0) + v(1..)ᵀc(1..), then c(0) −= τ·w and c(1..) −= τ·w·v(1..).
  (func (export "reflect") (param $v i32) (param $tau f64) (param $c i32) (param $len i32)
    (local $tw f64)
    (if (f64.eq (local.get $tau) (f64.const 0)) (then (return)))
    (local.set $tw (f64.mul (local.get $tau)
      (f64.add (f64.load (local.get $c))
        (call $dot (i32.add (local.get $v) (i32.const 8)) (i32.add (local.get $c) (i32.const 8))
          (i32.sub (local.get $len) (i32.const 1))))))
    (f64.store (local.get $c) (f64.sub (f64.load (local.get $c)) (local.get $tw)))
    (call $axpy (local.get $tw) (i32.add (local.get $v) (i32.const 8)) (i32.add (local.get $c) (i32.const 8))
      (i32.sub (local.get $len) (i32.const 1))))

  ;; a[i] ← a[i]·f for i < len.
  (func (export "scale") (param $a i32) (param $len i32) (param $f f64)
    (local $i i32) (local $at i32) (local $ff v128)
    (local.set $ff (f64x2.splat (local.get $f)))
    (block $pairsDone
      (loop $pairs
        (br_if $pairsDone (i32.ge_u (i32.add (local.get $i) (i32.const 1)) (local.get $len)))
        (local.set $at (i32.add (local.get $a) (i32.shl (local.get $i) (i32.const 3))))
        (v128.store (local.get $at) (f64x2.mul (v128.load (local.get $at)) (local.get $ff)))
        (local.set $i (i32.add (local.get $i) (i32.const 2)))
        (br $pairs)))
    (if (i32.lt_u (local.get $i) (local.get $len))
      (then
        (local.set $at (i32.add (local.get $a) (i32.shl (local.get $i) (i32.const 3))))
        (f64.store (local.get $at) (f64.mul (f64.load (local.get $at)) (local.get $f))))))

  ;; Swaps a[0..len) and b[0..len) (neither overlapping the other).
  (func (export "swap") (param $a i32) (param $b i32) (param $len i32)
    (local $i i32) (local $end i32) (local $t v128)
    (local.set $end (i32.shl (local.get $len) (i32.const 3)))
    (block $done
      (loop $step
        (br_if $done (i32.ge_u (i32.add (local.get $i) (i32.const 8)) (local.get $end)))
        (local.set $t (v128.load (i32.add (local.get $a) (local.get $i))))
        (v128.store (i32.add (local.get $a) (local.get $i)) (v128.load (i32.add (local.get $b) (local.get $i))))
        (v128.store (i32.add (local.get $b) (local.get $i)) (local.get $t))
        (local.set $i (i32.add (local.get $i) (i32.const 16)))
        (br $step)))
    (if (i32.lt_u (local.get $i) (local.get $end))
      (then
        (local.set $t (v128.load64_zero (i32.add (local.get $a) (local.get $i))))
        (f64.store (i32.add (local.get $a) (local.get $i)) (f64.load (i32.add (local.get $b) (local.get $i))))
        (v128.store64_lane 0 (i32.add (local.get $b) (local.get $i)) (local.get $t)))))
)
