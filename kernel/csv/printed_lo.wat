;; The decimal corrections of doubles taken as printed decimals of at most 15
;; significant digits, in WebAssembly: cells/fit/_printed_lo.ts's `correction`
;; for a block of values, the same IEEE operations in the same order, so the
;; same bits (its test: kernel/csv/printed_lo_test.ts). The source of
;; _printed_lo_bytes.ts (assembled by kernel/wasm/build.ts). Driven by
;; printed_lo.ts, whose notes give the method.
;;
;; Memory (bytes): 0 f64 10^0…10^22 · 512 per binade 2^−30 … 2^52, 16 bytes:
;; i32 the count of the doubles nearest 10^−8…10^14 at or below its start, f64
;; the one of them inside it (+∞ if none) · 2048 on: values in and corrections
;; out, placed by the caller. The caller writes both tables before the first call.
(module
  (memory (export "memory") 4)

  ;; Dekker's exact product error of a·b = p (kernel/dd.ts productError).
  (func $productError (param $a f64) (param $b f64) (param $p f64) (result f64)
    (local $c f64) (local $ah f64) (local $al f64) (local $bh f64) (local $bl f64)
    (local.set $c (f64.mul (f64.const 134217729) (local.get $a)))
    (local.set $ah (f64.sub (local.get $c) (f64.sub (local.get $c) (local.get $a))))
    (local.set $al (f64.sub (local.get $a) (local.get $ah)))
    (local.set $c (f64.mul (f64.const 134217729) (local.get $b)))
    (local.set $bh (f64.sub (local.get $c) (f64.sub (local.get $c) (local.get $b))))
    (local.set $bl (f64.sub (local.get $b) (local.get $bh)))
    (f64.add
      (f64.add
        (f64.add (f64.sub (f64.mul (local.get $ah) (local.get $bh)) (local.get $p))
          (f64.mul (local.get $ah) (local.get $bl)))
        (f64.mul (local.get $al) (local.get $bh)))
      (f64.mul (local.get $al) (local.get $bl))))

  ;; Math.round: the nearest integer, halves toward +∞ (p − floor(p) is exact).
  (func $round (param $p f64) (result f64)
    (local $f f64)
    (local.set $f (f64.floor (local.get $p)))
    (select
      (f64.add (local.get $f) (f64.const 1))
      (local.get $f)
      (f64.ge (f64.sub (local.get $p) (local.get $f)) (f64.const 0.5))))

  ;; floor(log₁₀ a) for 10^−8 ≤ a < 10^15, −9 below, as a count of the decades'
  ;; doubles at or below a, less 9: by a's binary exponent e, the count at 2^e
  ;; and the one decade's double in [2^e, 2^(e+1)) if any (+∞ if none), so one
  ;; comparison and no branch (two powers of ten never share a binade).
  (func $decade (param $a f64) (result i32)
    (local $e i32) (local $at i32)
    (local.set $e (i32.sub
      (i32.wrap_i64 (i64.shr_u (i64.reinterpret_f64 (local.get $a)) (i64.const 52)))
      (i32.const 993)))
    ;; e + 30 (binades 2^−30 … 2^52 in the table; below them the count is 0).
    (if (i32.lt_s (local.get $e) (i32.const 0)) (then (return (i32.const -9))))
    (local.set $at (i32.add (i32.const 512) (i32.shl (local.get $e) (i32.const 4))))
    (i32.sub
      (i32.add (i32.load (local.get $at)) (f64.ge (local.get $a) (f64.load offset=8 (local.get $at))))
      (i32.const 9)))

  ;; The correction of one value; 0 when there is none to recover.
  (func $correction (param $v f64) (result f64)
    (local $k i32) (local $t f64) (local $p f64) (local $m f64)
    ;; Integers, non-finite values and |v| ≥ 10^15 have none.
    (if (f64.ne (f64.sub (local.get $v) (local.get $v)) (f64.const 0)) (then (return (f64.const 0))))
    (if (f64.eq (f64.trunc (local.get $v)) (local.get $v)) (then (return (f64.const 0))))
    (if (f64.ge (f64.abs (local.get $v)) (f64.const 1e15)) (then (return (f64.const 0))))
    (local.set $k (i32.sub (i32.const 14) (call $decade (f64.abs (local.get $v)))))
    (if (i32.gt_s (local.get $k) (i32.const 22)) (then (local.set $k (i32.const 22))))
    (local.set $t (f64.load (i32.shl (local.get $k) (i32.const 3))))
    (local.set $p (f64.mul (local.get $v) (local.get $t)))
    (local.set $m (call $round (local.get $p)))
    (if (i32.and (f64.ge (f64.abs (local.get $m)) (f64.const 1e15)) (i32.gt_s (local.get $k) (i32.const 0)))
      (then
        ;; v just under a power of ten whose double is above it: one decimal fewer.
        (local.set $k (i32.sub (local.get $k) (i32.const 1)))
        (local.set $t (f64.load (i32.shl (local.get $k) (i32.const 3))))
        (local.set $p (f64.mul (local.get $v) (local.get $t)))
        (local.set $m (call $round (local.get $p)))))
    (if (i32.eqz (f64.lt (f64.abs (local.get $m)) (f64.const 1e15))) (then (return (f64.const 0))))
    (if (f64.ne (f64.div (local.get $m) (local.get $t)) (local.get $v)) (then (return (f64.const 0))))
    (f64.div
      (f64.sub (f64.sub (local.get $m) (local.get $p)) (call $productError (local.get $v) (local.get $t) (local.get $p)))
      (local.get $t)))

  ;; out[i] = the correction of in[i] for i < n; returns how many are not 0.
  (func (export "corrections") (param $in i32) (param $out i32) (param $n i32) (result i32)
    (local $i i32) (local $lo f64) (local $some i32)
    (block $done
      (loop $each
        (br_if $done (i32.ge_u (local.get $i) (local.get $n)))
        (local.set $lo (call $correction (f64.load (i32.add (local.get $in) (i32.shl (local.get $i) (i32.const 3))))))
        (f64.store (i32.add (local.get $out) (i32.shl (local.get $i) (i32.const 3))) (local.get $lo))
        (local.set $some (i32.add (local.get $some) (f64.ne (local.get $lo) (f64.const 0))))
        (local.set $i (i32.add (local.get $i) (i32.const 1)))
        (br $each)))
    (local.get $some))
)
