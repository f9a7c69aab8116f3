;; The CSV reader's fast lane for plain records, in WebAssembly: the source of
;; _plain_lane_bytes.ts (built by kernel/wasm/build.ts with WABT; plain_wasm_test.ts
;; checks that the two agree). Driven by _plain_wasm.ts.
;;
;; rows(p, end, ncols, maxRows, out, stride, delim, point) reads plain records
;; from byte p of this module's memory, up to `end` (one past a line feed) or
;; `maxRows` rows, writing column c of row r as the f64 at out + 8·(c·stride + r)
;; and counting missing (empty) fields per column; it returns the rows read and
;; leaves in the global `stop` the first byte not read (a record's start). At
;; the first record that is not plain in this lane's narrower sense (a blank
;; line, a quote, a byte of 0x80 or more, a missing-value marker other than the
;; empty field, more than 15 digits, more than four exponent digits, a power of
;; ten beyond 10^±22, a lone CR, a wrong field count) it stops at that record's
;; first byte and leaves it to the JavaScript lane, which reads it (or stops in
;; turn, for the general scanner). Every number it takes is Clinger's fast path,
;; m·10^k or m/10^−k with m < 2^53 and |k| ≤ 22, the same IEEE operation as the
;; JavaScript lane's, so the values are the same bit for bit.
;;
;; Digits are read eight at a time from one unaligned 64-bit load: XOR with
;; 0x30 in every byte gives digit values (a byte is a digit exactly when that is
;; below 10; no borrow crosses bytes), the count of leading digits is the
;; trailing zeros of a per-byte "not a digit" mask over 8, and the digits'
;; value takes three multiplications (Lemire, "Number parsing at a gigabyte per
;; second", Software: Practice and Experience 51(8), 2021, the eight-digit
;; method; from memory). Loads may read up to seven bytes past a record: the
;; caller leaves room after the input.
;;
;; Memory (bytes): 0 f64 10^0…10^22 · 256 i64 10^0…10^8 · 1024 i32 missing per
;; column · 17408 u8 skip per column (1: not parsed) · 21504 i32 the record's
;; missing columns · 65536 on: input and output, placed by the caller. The
;; caller writes both tables of powers before the first call.
(module
  (memory (export "memory") 80)
  (global $stop (export "stop") (mut i32) (i32.const 0))

  ;; The value of the first n digits (0 ≤ n ≤ 8) of w, whose bytes are digit
  ;; values (byte 0 the most significant): shifted so the n digits fill the top
  ;; bytes (the zeros below them read as leading zeros), then combined in three
  ;; multiplications: pairs, then fours, then the eight.
  (func $eight (param $w i64) (param $n i32) (result i64)
    (local $t i64)
    (local.set $t (select
      (i64.shl (local.get $w) (i64.extend_i32_u (i32.shl (i32.sub (i32.const 8) (local.get $n)) (i32.const 3))))
      (i64.const 0)
      (local.get $n)))
    (local.set $t (i64.add (i64.mul (local.get $t) (i64.const 10)) (i64.shr_u (local.get $t) (i64.const 8))))
    (i64.shr_u
      (i64.add
        (i64.mul (i64.and (local.get $t) (i64.const 0x000000FF000000FF)) (i64.const 0x000F424000000064))
        (i64.mul (i64.and (i64.shr_u (local.get $t) (i64.const 16)) (i64.const 0x000000FF000000FF)) (i64.const 0x0000271000000001)))
      (i64.const 32)))

  ;; Digit values of the eight bytes at p (a byte is a digit exactly when its value is below 10).
  (func $word (param $p i32) (result i64)
    (i64.xor (i64.load (local.get $p)) (i64.const 0x3030303030303030)))

  ;; How many of w's bytes, from byte 0, are digits (8 when all are: ctz of 0 is 64).
  (func $lead (param $w i64) (result i32)
    (i32.wrap_i64 (i64.shr_u
      (i64.ctz (i64.and
        (i64.or (i64.add (i64.and (local.get $w) (i64.const 0x7F7F7F7F7F7F7F7F)) (i64.const 0x7676767676767676)) (local.get $w))
        (i64.const 0x8080808080808080)))
      (i64.const 3))))

  (func (export "rows") (param $p i32) (param $end i32) (param $ncols i32) (param $maxRows i32)
        (param $out i32) (param $stride i32) (param $delim i32) (param $point i32) (result i32)
    (local $r i32) (local $c i32) (local $rowStart i32) (local $nh i32) (local $ch i32)
    (local $q i32) (local $neg i32) (local $w i64) (local $nd i64) (local $n i32) (local $m i64)
    (local $digits i32) (local $frac i32) (local $exp i32) (local $eneg i32) (local $ed i32)
    (local $k i32) (local $hi f64) (local $h i32) (local $last i32)
    (local.set $last (i32.sub (local.get $ncols) (i32.const 1)))
    (block $exit
      (loop $rows
        (br_if $exit (i32.ge_u (local.get $r) (local.get $maxRows)))
        (br_if $exit (i32.ge_u (local.get $p) (local.get $end)))
        (local.set $rowStart (local.get $p))
        (local.set $nh (i32.const 0))
        (local.set $c (i32.const 0))
        (block $fail
          ;; A blank line before a record is the JavaScript lane's (it skips them).
          (local.set $ch (i32.load8_u (local.get $p)))
          (br_if $fail (i32.eq (local.get $ch) (i32.const 10)))
          (br_if $fail (i32.eq (local.get $ch) (i32.const 13)))
          (loop $cols
            (if (i32.load8_u offset=17408 (local.get $c))
              (then
                ;; A column not parsed: plain ASCII up to the field's end.
                (block $skipped
                  (loop $skip
                    (local.set $ch (i32.load8_u (local.get $p)))
                    (br_if $skipped (i32.eq (local.get $ch) (local.get $delim)))
                    (br_if $skipped (i32.eq (local.get $ch) (i32.const 10)))
                    (br_if $skipped (i32.eq (local.get $ch) (i32.const 13)))
                    (br_if $fail (i32.eq (local.get $ch) (i32.const 34)))
                    (br_if $fail (i32.ge_u (local.get $ch) (i32.const 128)))
                    (local.set $p (i32.add (local.get $p) (i32.const 1)))
                    (br $skip))))
              (else
                (local.set $q (local.get $p))
                (local.set $ch (i32.load8_u (local.get $p)))
                (local.set $neg (i32.eq (local.get $ch) (i32.const 45)))
                (if (i32.or (local.get $neg) (i32.eq (local.get $ch) (i32.const 43)))
                  (then (local.set $p (i32.add (local.get $p) (i32.const 1)))))
                (local.set $m (i64.const 0))
                (local.set $digits (i32.const 0))
                (local.set $frac (i32.const 0))
                ;; Digits before the point, eight at a time (m = m·10^n + the next n digits).
                (block $intDone
                  (loop $int
                    (local.set $w (call $word (local.get $p)))
                    (local.set $n (call $lead (local.get $w)))
                    (br_if $intDone (i32.eqz (local.get $n)))
                    (local.set $m (i64.add
                      (i64.mul (local.get $m) (i64.load offset=256 (i32.shl (local.get $n) (i32.const 3))))
                      (call $eight (local.get $w) (local.get $n))))
                    (local.set $digits (i32.add (local.get $digits) (local.get $n)))
                    (local.set $p (i32.add (local.get $p) (local.get $n)))
                    (br_if $fail (i32.gt_u (local.get $digits) (i32.const 15)))
                    (br_if $int (i32.eq (local.get $n) (i32.const 8)))))
                ;; The point and the digits after it.
                (if (i32.eq (i32.load8_u (local.get $p)) (local.get $point))
                  (then
                    (local.set $p (i32.add (local.get $p) (i32.const 1)))
                    (block $fracDone
                      (loop $fr
                        (local.set $w (call $word (local.get $p)))
                        (local.set $n (call $lead (local.get $w)))
                        (br_if $fracDone (i32.eqz (local.get $n)))
                        (local.set $m (i64.add
                          (i64.mul (local.get $m) (i64.load offset=256 (i32.shl (local.get $n) (i32.const 3))))
                          (call $eight (local.get $w) (local.get $n))))
                        (local.set $digits (i32.add (local.get $digits) (local.get $n)))
                        (local.set $frac (i32.add (local.get $frac) (local.get $n)))
                        (local.set $p (i32.add (local.get $p) (local.get $n)))
                        (br_if $fail (i32.gt_u (local.get $digits) (i32.const 15)))
                        (br_if $fr (i32.eq (local.get $n) (i32.const 8)))))))
                (if (i32.eqz (local.get $digits))
                  (then
                    ;; No digits: an empty field is missing; anything else is the JavaScript lane's.
                    (br_if $fail (i32.ne (local.get $p) (local.get $q)))
                    (local.set $hi (f64.const nan))
                    (i32.store offset=21504 (i32.shl (local.get $nh) (i32.const 2)) (local.get $c))
                    (local.set $nh (i32.add (local.get $nh) (i32.const 1))))
                  (else
                    (local.set $exp (i32.const 0))
                    (if (i32.eq (i32.or (i32.load8_u (local.get $p)) (i32.const 32)) (i32.const 101))
                      (then
                        (local.set $p (i32.add (local.get $p) (i32.const 1)))
                        (local.set $ch (i32.load8_u (local.get $p)))
                        (local.set $eneg (i32.eq (local.get $ch) (i32.const 45)))
                        (if (i32.or (local.get $eneg) (i32.eq (local.get $ch) (i32.const 43)))
                          (then (local.set $p (i32.add (local.get $p) (i32.const 1)))))
                        (local.set $ed (i32.const 0))
                        (block $expDone
                          (loop $ex
                            (local.set $ch (i32.sub (i32.load8_u (local.get $p)) (i32.const 48)))
                            (br_if $expDone (i32.ge_u (local.get $ch) (i32.const 10)))
                            (local.set $exp (i32.add (i32.mul (local.get $exp) (i32.const 10)) (local.get $ch)))
                            (local.set $ed (i32.add (local.get $ed) (i32.const 1)))
                            (local.set $p (i32.add (local.get $p) (i32.const 1)))
                            (br_if $fail (i32.gt_u (local.get $ed) (i32.const 4)))
                            (br $ex)))
                        (br_if $fail (i32.eqz (local.get $ed)))
                        (if (local.get $eneg) (then (local.set $exp (i32.sub (i32.const 0) (local.get $exp)))))))
                    (local.set $k (i32.sub (local.get $exp) (local.get $frac)))
                    (br_if $fail (i32.gt_s (local.get $k) (i32.const 22)))
                    (br_if $fail (i32.lt_s (local.get $k) (i32.const -22)))
                    (local.set $hi (f64.convert_i64_u (local.get $m)))
                    (if (i32.ge_s (local.get $k) (i32.const 0))
                      (then (local.set $hi (f64.mul (local.get $hi) (f64.load (i32.shl (local.get $k) (i32.const 3))))))
                      (else (local.set $hi (f64.div (local.get $hi) (f64.load (i32.shl (i32.sub (i32.const 0) (local.get $k)) (i32.const 3)))))))
                    (if (local.get $neg) (then (local.set $hi (f64.neg (local.get $hi)))))))
                (f64.store
                  (i32.add (local.get $out)
                    (i32.shl (i32.add (i32.mul (local.get $c) (local.get $stride)) (local.get $r)) (i32.const 3)))
                  (local.get $hi))))
            ;; The field's end: the delimiter, or after the last field a line end.
            (local.set $ch (i32.load8_u (local.get $p)))
            (if (i32.lt_u (local.get $c) (local.get $last))
              (then
                (br_if $fail (i32.ne (local.get $ch) (local.get $delim)))
                (local.set $p (i32.add (local.get $p) (i32.const 1)))
                (local.set $c (i32.add (local.get $c) (i32.const 1)))
                (br $cols)))
            (if (i32.eq (local.get $ch) (i32.const 10))
              (then (local.set $p (i32.add (local.get $p) (i32.const 1))))
              (else
                (br_if $fail (i32.ne (local.get $ch) (i32.const 13)))
                (br_if $fail (i32.ne (i32.load8_u offset=1 (local.get $p)) (i32.const 10)))
                (local.set $p (i32.add (local.get $p) (i32.const 2))))))
          ;; A whole record: its missing fields count.
          (local.set $h (i32.const 0))
          (block $holesDone
            (loop $holes
              (br_if $holesDone (i32.ge_u (local.get $h) (local.get $nh)))
              (local.set $c (i32.shl (i32.load offset=21504 (i32.shl (local.get $h) (i32.const 2))) (i32.const 2)))
              (i32.store offset=1024 (local.get $c) (i32.add (i32.load offset=1024 (local.get $c)) (i32.const 1)))
              (local.set $h (i32.add (local.get $h) (i32.const 1)))
              (br $holes)))
          (local.set $r (i32.add (local.get $r) (i32.const 1)))
          (br $rows))
        ;; Not plain here: this record is the JavaScript lane's.
        (local.set $p (local.get $rowStart))))
    (global.set $stop (local.get $p))
    (local.get $r))
)
