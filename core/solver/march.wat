;; The transient solver's time loop for linear nets (no behavioural pads), the same arithmetic as
;; `marchJs` in core/solver/march.ts, operation for operation, so both give the same samples to
;; round-off (docs/solver.md §6). Every array lives in this module's memory at the byte offset its
;; parameter gives; i32 arrays (node indices, line integers, factor columns) and f64 arrays as in
;; the JavaScript. Node i's sample m goes to out[i * stride + m].
;;
;; Built into core/solver/march-wasm.ts by scripts/build-wasm.mjs (the bytes are committed; a test
;; checks they match this source).
(module
  (memory (export "memory") 1)
  (func (export "march")
    (param $n i32) (param $nc i32) (param $ni i32) (param $nl i32) (param $steps i32)
    (param $h f64) (param $v0 f64) (param $v1 f64) (param $ramp f64) (param $gd f64) (param $drv i32)
    (param $stride i32) (param $diagonal i32)
    (param $x i32) (param $rhs i32) (param $rhsConst i32)
    (param $capA i32) (param $capB i32) (param $capG2 i32) (param $capJ i32)
    (param $indA i32) (param $indB i32) (param $indG2 i32) (param $indJ i32)
    (param $lineInt i32) (param $lineG2 i32) (param $frac i32) (param $ring i32)
    (param $perm i32) (param $lStart i32) (param $lCol i32) (param $lVal i32)
    (param $uStart i32) (param $uCol i32) (param $uVal i32) (param $invDiag i32) (param $out i32)
    (local $m i32) (local $k i32) (local $q i32) (local $a i32) (local $b i32) (local $i i32)
    (local $p i32) (local $end i32) (local $row i32) (local $mask i32) (local $base i32)
    (local $pw i32) (local $s0 i32) (local $p0 i32) (local $p1 i32) (local $ps i32)
    (local $ax i32) (local $bx i32) (local $ra i32) (local $rb i32) (local $o i32)
    (local $time f64) (local $vs f64) (local $j f64) (local $dv f64) (local $g f64) (local $f f64)
    (local $e0a f64) (local $e0b f64) (local $ha f64) (local $hb f64) (local $acc f64)
    (local.set $dv (f64.sub (local.get $v1) (local.get $v0)))
    (local.set $m (i32.const 1))
    (block $done
      (loop $step
        (br_if $done (i32.gt_s (local.get $m) (local.get $steps)))
        (local.set $time (f64.mul (f64.convert_i32_s (local.get $m)) (local.get $h)))
        ;; the driver's source: the ramp, then the new level
        (local.set $vs (local.get $v1))
        (if (i32.and (f64.gt (local.get $ramp) (f64.const 0)) (f64.lt (local.get $time) (local.get $ramp)))
          (then (local.set $vs (f64.add (local.get $v0)
            (f64.div (f64.mul (local.get $dv) (local.get $time)) (local.get $ramp))))))
        (local.set $ra (i32.add (local.get $rhs) (i32.shl (local.get $drv) (i32.const 3))))
        (f64.store (local.get $ra) (f64.add (f64.load (local.get $ra)) (f64.mul (local.get $vs) (local.get $gd))))
        ;; capacitors: J = 2g (x[a] - x[b]) - J
        (local.set $k (i32.const 0))
        (block $capsDone
          (loop $caps
            (br_if $capsDone (i32.ge_s (local.get $k) (local.get $nc)))
            (local.set $a (i32.load (i32.add (local.get $capA) (i32.shl (local.get $k) (i32.const 2)))))
            (local.set $b (i32.load (i32.add (local.get $capB) (i32.shl (local.get $k) (i32.const 2)))))
            (local.set $o (i32.add (local.get $capJ) (i32.shl (local.get $k) (i32.const 3))))
            (local.set $j (f64.sub
              (f64.mul (f64.load (i32.add (local.get $capG2) (i32.shl (local.get $k) (i32.const 3))))
                (f64.sub (f64.load (i32.add (local.get $x) (i32.shl (local.get $a) (i32.const 3))))
                         (f64.load (i32.add (local.get $x) (i32.shl (local.get $b) (i32.const 3))))))
              (f64.load (local.get $o))))
            (f64.store (local.get $o) (local.get $j))
            (local.set $ra (i32.add (local.get $rhs) (i32.shl (local.get $a) (i32.const 3))))
            (f64.store (local.get $ra) (f64.add (f64.load (local.get $ra)) (local.get $j)))
            (local.set $rb (i32.add (local.get $rhs) (i32.shl (local.get $b) (i32.const 3))))
            (f64.store (local.get $rb) (f64.sub (f64.load (local.get $rb)) (local.get $j)))
            (local.set $k (i32.add (local.get $k) (i32.const 1)))
            (br $caps)))
        ;; inductors: J = 2g (x[a] - x[b]) + J
        (local.set $k (i32.const 0))
        (block $indsDone
          (loop $inds
            (br_if $indsDone (i32.ge_s (local.get $k) (local.get $ni)))
            (local.set $a (i32.load (i32.add (local.get $indA) (i32.shl (local.get $k) (i32.const 2)))))
            (local.set $b (i32.load (i32.add (local.get $indB) (i32.shl (local.get $k) (i32.const 2)))))
            (local.set $o (i32.add (local.get $indJ) (i32.shl (local.get $k) (i32.const 3))))
            (local.set $j (f64.add
              (f64.mul (f64.load (i32.add (local.get $indG2) (i32.shl (local.get $k) (i32.const 3))))
                (f64.sub (f64.load (i32.add (local.get $x) (i32.shl (local.get $a) (i32.const 3))))
                         (f64.load (i32.add (local.get $x) (i32.shl (local.get $b) (i32.const 3))))))
              (f64.load (local.get $o))))
            (f64.store (local.get $o) (local.get $j))
            (local.set $ra (i32.add (local.get $rhs) (i32.shl (local.get $a) (i32.const 3))))
            (f64.store (local.get $ra) (f64.sub (f64.load (local.get $ra)) (local.get $j)))
            (local.set $rb (i32.add (local.get $rhs) (i32.shl (local.get $b) (i32.const 3))))
            (f64.store (local.get $rb) (f64.add (f64.load (local.get $rb)) (local.get $j)))
            (local.set $k (i32.add (local.get $k) (i32.const 1)))
            (br $inds)))
        ;; lines: complete the previous sample's e at both ends, read the history one delay back,
        ;; park it in this sample's slot, add it to the right-hand side
        (local.set $k (i32.const 0))
        (local.set $q (local.get $lineInt))
        (block $linesDone
          (loop $lines
            (br_if $linesDone (i32.ge_s (local.get $k) (local.get $nl)))
            (local.set $base (i32.load (local.get $q)))
            (local.set $mask (i32.load offset=4 (local.get $q)))
            (local.set $a (i32.load offset=12 (local.get $q)))
            (local.set $b (i32.load offset=16 (local.get $q)))
            (local.set $ax (i32.add (local.get $x) (i32.shl (local.get $a) (i32.const 3))))
            (local.set $bx (i32.add (local.get $x) (i32.shl (local.get $b) (i32.const 3))))
            (local.set $g (f64.load (i32.add (local.get $lineG2) (i32.shl (local.get $k) (i32.const 3)))))
            ;; pw: byte address of slot (m - 1) & mask
            (local.set $pw (i32.add (local.get $ring) (i32.shl
              (i32.add (local.get $base) (i32.shl (i32.and (i32.sub (local.get $m) (i32.const 1)) (local.get $mask)) (i32.const 1)))
              (i32.const 3))))
            (f64.store (local.get $pw) (f64.sub (f64.mul (local.get $g) (f64.load (local.get $ax))) (f64.load (local.get $pw))))
            (f64.store offset=8 (local.get $pw) (f64.sub (f64.mul (local.get $g) (f64.load (local.get $bx))) (f64.load offset=8 (local.get $pw))))
            (local.set $s0 (i32.and (i32.sub (local.get $m) (i32.load offset=8 (local.get $q))) (local.get $mask)))
            (local.set $p0 (i32.add (local.get $ring) (i32.shl
              (i32.add (local.get $base) (i32.shl (local.get $s0) (i32.const 1))) (i32.const 3))))
            (local.set $p1 (i32.add (local.get $ring) (i32.shl
              (i32.add (local.get $base) (i32.shl (i32.and (i32.sub (local.get $s0) (i32.const 1)) (local.get $mask)) (i32.const 1)))
              (i32.const 3))))
            (local.set $f (f64.load (i32.add (local.get $frac) (i32.shl (local.get $k) (i32.const 3)))))
            (local.set $e0a (f64.load (local.get $p0)))
            (local.set $e0b (f64.load offset=8 (local.get $p0)))
            (local.set $ha (f64.add (local.get $e0b) (f64.mul (local.get $f) (f64.sub (f64.load offset=8 (local.get $p1)) (local.get $e0b)))))
            (local.set $hb (f64.add (local.get $e0a) (f64.mul (local.get $f) (f64.sub (f64.load (local.get $p1)) (local.get $e0a)))))
            (local.set $ps (i32.add (local.get $ring) (i32.shl
              (i32.add (local.get $base) (i32.shl (i32.and (local.get $m) (local.get $mask)) (i32.const 1)))
              (i32.const 3))))
            (f64.store (local.get $ps) (local.get $ha))
            (f64.store offset=8 (local.get $ps) (local.get $hb))
            (local.set $ra (i32.add (local.get $rhs) (i32.shl (local.get $a) (i32.const 3))))
            (f64.store (local.get $ra) (f64.add (f64.load (local.get $ra)) (local.get $ha)))
            (local.set $rb (i32.add (local.get $rhs) (i32.shl (local.get $b) (i32.const 3))))
            (f64.store (local.get $rb) (f64.add (f64.load (local.get $rb)) (local.get $hb)))
            (local.set $k (i32.add (local.get $k) (i32.const 1)))
            (local.set $q (i32.add (local.get $q) (i32.const 20)))
            (br $lines)))
        ;; substitution
        (if (local.get $diagonal)
          (then
            (local.set $i (i32.const 0))
            (block $diagDone
              (loop $diag
                (br_if $diagDone (i32.ge_s (local.get $i) (local.get $n)))
                (local.set $ra (i32.add (local.get $rhs) (i32.shl (local.get $i) (i32.const 3))))
                (local.set $acc (f64.mul (f64.load (local.get $ra))
                  (f64.load (i32.add (local.get $invDiag) (i32.shl (local.get $i) (i32.const 3))))))
                (f64.store (local.get $ra) (f64.load (i32.add (local.get $rhsConst) (i32.shl (local.get $i) (i32.const 3)))))
                (f64.store (i32.add (local.get $x) (i32.shl (local.get $i) (i32.const 3))) (local.get $acc))
                (f64.store (i32.add (local.get $out) (i32.shl
                  (i32.add (i32.mul (local.get $i) (local.get $stride)) (local.get $m)) (i32.const 3))) (local.get $acc))
                (local.set $i (i32.add (local.get $i) (i32.const 1)))
                (br $diag))))
          (else
            ;; forward: x[i] = rhs[perm[i]] - sum L[i][c] x[c]
            (local.set $i (i32.const 0))
            (block $fwdDone
              (loop $fwd
                (br_if $fwdDone (i32.ge_s (local.get $i) (local.get $n)))
                (local.set $row (i32.load (i32.add (local.get $perm) (i32.shl (local.get $i) (i32.const 2)))))
                (local.set $ra (i32.add (local.get $rhs) (i32.shl (local.get $row) (i32.const 3))))
                (local.set $acc (f64.load (local.get $ra)))
                (f64.store (local.get $ra) (f64.load (i32.add (local.get $rhsConst) (i32.shl (local.get $row) (i32.const 3)))))
                (local.set $p (i32.load (i32.add (local.get $lStart) (i32.shl (local.get $i) (i32.const 2)))))
                (local.set $end (i32.load offset=4 (i32.add (local.get $lStart) (i32.shl (local.get $i) (i32.const 2)))))
                (block $lDone
                  (loop $l
                    (br_if $lDone (i32.ge_s (local.get $p) (local.get $end)))
                    (local.set $acc (f64.sub (local.get $acc) (f64.mul
                      (f64.load (i32.add (local.get $lVal) (i32.shl (local.get $p) (i32.const 3))))
                      (f64.load (i32.add (local.get $x) (i32.shl
                        (i32.load (i32.add (local.get $lCol) (i32.shl (local.get $p) (i32.const 2)))) (i32.const 3)))))))
                    (local.set $p (i32.add (local.get $p) (i32.const 1)))
                    (br $l)))
                (f64.store (i32.add (local.get $x) (i32.shl (local.get $i) (i32.const 3))) (local.get $acc))
                (local.set $i (i32.add (local.get $i) (i32.const 1)))
                (br $fwd)))
            ;; back: x[i] = (x[i] - sum U[i][c] x[c]) / U[i][i]
            (local.set $i (i32.sub (local.get $n) (i32.const 1)))
            (block $backDone
              (loop $back
                (br_if $backDone (i32.lt_s (local.get $i) (i32.const 0)))
                (local.set $ax (i32.add (local.get $x) (i32.shl (local.get $i) (i32.const 3))))
                (local.set $acc (f64.load (local.get $ax)))
                (local.set $p (i32.load (i32.add (local.get $uStart) (i32.shl (local.get $i) (i32.const 2)))))
                (local.set $end (i32.load offset=4 (i32.add (local.get $uStart) (i32.shl (local.get $i) (i32.const 2)))))
                (block $uDone
                  (loop $u
                    (br_if $uDone (i32.ge_s (local.get $p) (local.get $end)))
                    (local.set $acc (f64.sub (local.get $acc) (f64.mul
                      (f64.load (i32.add (local.get $uVal) (i32.shl (local.get $p) (i32.const 3))))
                      (f64.load (i32.add (local.get $x) (i32.shl
                        (i32.load (i32.add (local.get $uCol) (i32.shl (local.get $p) (i32.const 2)))) (i32.const 3)))))))
                    (local.set $p (i32.add (local.get $p) (i32.const 1)))
                    (br $u)))
                (local.set $acc (f64.mul (local.get $acc)
                  (f64.load (i32.add (local.get $invDiag) (i32.shl (local.get $i) (i32.const 3))))))
                (f64.store (local.get $ax) (local.get $acc))
                (f64.store (i32.add (local.get $out) (i32.shl
                  (i32.add (i32.mul (local.get $i) (local.get $stride)) (local.get $m)) (i32.const 3))) (local.get $acc))
                (local.set $i (i32.sub (local.get $i) (i32.const 1)))
                (br $back)))))
        (local.set $m (i32.add (local.get $m) (i32.const 1)))
        (br $step))))
)
