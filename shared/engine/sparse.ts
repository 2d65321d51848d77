/**
 * A sparse, complex, symmetric linear system A·x = b, solved by LDLᵀ factorisation in a
 * minimum-degree order with one step of iterative refinement.
 *
 * Why no pivoting: the nodal matrix of a passive network with a conductance to ground at
 * every node has a positive-definite real part, for which elimination in any order has
 * non-zero pivots. The only rows without that property are ideal voltage-source rows, which
 * are eliminated after every node row (their pivot is then the Schur complement, non-zero
 * unless sources form a loop — checked before solving, and caught here as a last resort).
 */

/**
 * Vectors are plain arrays of numbers: V8 makes those far faster than typed arrays for the
 * small sizes of a bank (a typed array costs about a microsecond to allocate here).
 */
export type Vec = number[]
const zeros = (n: number): Vec => new Array<number>(n).fill(0)

export class SingularSystemError extends Error {
  constructor(readonly unknown: number) {
    super(`the network equations have no unique solution (unknown ${unknown})`)
  }
}

/** Min-heap of (degree, row) pairs encoded as one number; stale entries are skipped on pop. */
class DegreeHeap {
  private items: number[] = []
  static readonly SHIFT = 2 ** 24

  push(degree: number, row: number) {
    const key = degree * DegreeHeap.SHIFT + row
    const a = this.items
    a.push(key)
    let i = a.length - 1
    while (i > 0) {
      const p = (i - 1) >> 1
      if (a[p]! <= key) break
      a[i] = a[p]!
      i = p
    }
    a[i] = key
  }

  pop(): number | undefined {
    const a = this.items
    if (a.length === 0) return undefined
    const top = a[0]!
    const last = a.pop()!
    if (a.length > 0) {
      let i = 0
      for (;;) {
        const l = 2 * i + 1
        if (l >= a.length) break
        const r = l + 1
        const c = r < a.length && a[r]! < a[l]! ? r : l
        if (a[c]! >= last) break
        a[i] = a[c]!
        i = c
      }
      a[i] = last
    }
    return top
  }
}

/** Below this many unknowns a dense factorisation is faster than the sparse one. */
export const DENSE_LIMIT = 48

export class ComplexSymmetricSystem {
  /**
   * The sparse form: adjJ[i] lists the neighbours j of row i (A[i][j] ≠ 0 as stamped, i ≠ j)
   * in the order they first appeared, adjS[i] the slot of each entry A[i][j] = A[j][i] in
   * offRe/offIm; offI/offJ name the two rows of each slot.
   */
  private adjJ: number[][]
  private adjS: number[][]
  private diagRe: Vec
  private diagIm: Vec
  private offRe: Vec = []
  private offIm: Vec = []
  private offI: number[] = []
  private offJ: number[] = []
  readonly rhsRe: Vec
  readonly rhsIm: Vec

  /** a small system is kept dense: A[i][j] at i·size + j */
  private denseRe: Vec | null = null
  private denseIm: Vec | null = null

  /**
   * @param size number of unknowns
   * @param lateFrom rows at or after this index (ideal-source rows) are eliminated last
   */
  constructor(
    readonly size: number,
    private readonly lateFrom = size,
    /**
     * the least real part a node row's pivot can have: with a conductance of at least this to
     * ground at every node and a passive network, the real part of the matrix is positive
     * definite, and so is that of every Schur complement (Re(y*Sy) = Re(x*Ax) for the x that
     * eliminates the rest), so each pivot's real part is at least the smallest leak. A pivot
     * computed below it has lost its digits to cancellation (a floating part held only by its
     * leaks, beside units of very low impedance): it is set to the floor, which only moves the
     * floating part's common potential, on which no reading between its nodes depends
     */
    private readonly nodePivotFloor = 0,
  ) {
    this.rhsRe = zeros(size)
    this.rhsIm = zeros(size)
    if (size <= DENSE_LIMIT) {
      this.denseRe = zeros(size * size)
      this.denseIm = zeros(size * size)
      this.diagRe = this.diagIm = []
      this.adjJ = this.adjS = []
      return
    }
    this.diagRe = zeros(size)
    this.diagIm = zeros(size)
    this.adjJ = new Array<number[]>(size)
    this.adjS = new Array<number[]>(size)
    for (let i = 0; i < size; i++) {
      this.adjJ[i] = []
      this.adjS[i] = []
    }
  }

  /** Adds (re + j·im) to A[i][j], and to A[j][i] when i ≠ j. */
  add(i: number, j: number, re: number, im: number) {
    const dRe = this.denseRe
    if (dRe) {
      const n = this.size
      dRe[i * n + j]! += re
      this.denseIm![i * n + j]! += im
      if (i !== j) {
        dRe[j * n + i]! += re
        this.denseIm![j * n + i]! += im
      }
      return
    }
    if (i === j) {
      this.diagRe[i]! += re
      this.diagIm[i]! += im
      return
    }
    const q = this.adjJ[i]!.indexOf(j)
    if (q < 0) {
      const slot = this.offRe.length
      this.offRe.push(re)
      this.offIm.push(im)
      this.offI.push(i)
      this.offJ.push(j)
      this.adjJ[i]!.push(j)
      this.adjS[i]!.push(slot)
      this.adjJ[j]!.push(i)
      this.adjS[j]!.push(slot)
    } else {
      const slot = this.adjS[i]![q]!
      this.offRe[slot]! += re
      this.offIm[slot]! += im
    }
  }

  /** Stamps an admittance y between rows a and b (either may be -1 for the reference). */
  addAdmittance(a: number, b: number, re: number, im: number) {
    if (a === b) return // both ends on one node: shorted out, it carries nothing
    if (a >= 0) this.add(a, a, re, im)
    if (b >= 0) this.add(b, b, re, im)
    if (a >= 0 && b >= 0) this.add(a, b, -re, -im)
  }

  addRhs(i: number, re: number, im: number) {
    if (i < 0) return
    this.rhsRe[i]! += re
    this.rhsIm[i]! += im
  }

  /** Solves and returns x; the system is consumed (factorised in place). */
  solve(): { re: Vec; im: Vec } {
    if (this.denseRe) return this.solveDense()
    const n = this.size
    const origCount = this.offRe.length
    const origOffRe = this.offRe.slice()
    const origOffIm = this.offIm.slice()
    const origDiagRe = this.diagRe.slice()
    const origDiagIm = this.diagIm.slice()
    const rowScale = zeros(n)
    for (let i = 0; i < n; i++) rowScale[i] = Math.sqrt(this.diagRe[i]! * this.diagRe[i]! + this.diagIm[i]! * this.diagIm[i]!)
    for (let s = 0; s < origCount; s++) {
      const m = Math.sqrt(origOffRe[s]! * origOffRe[s]! + origOffIm[s]! * origOffIm[s]!)
      const i = this.offI[s]!
      const j = this.offJ[s]!
      if (m > rowScale[i]!) rowScale[i] = m
      if (m > rowScale[j]!) rowScale[j] = m
    }

    const factor = this.factorise(rowScale)
    const x = factor.apply(this.rhsRe, this.rhsIm)

    // one step of iterative refinement against the original matrix
    const rRe = this.rhsRe.slice()
    const rIm = this.rhsIm.slice()
    for (let i = 0; i < n; i++) {
      const ar = origDiagRe[i]!
      const ai = origDiagIm[i]!
      rRe[i]! -= ar * x.re[i]! - ai * x.im[i]!
      rIm[i]! -= ar * x.im[i]! + ai * x.re[i]!
    }
    for (let s = 0; s < origCount; s++) {
      const i = this.offI[s]!
      const j = this.offJ[s]!
      const ar = origOffRe[s]!
      const ai = origOffIm[s]!
      rRe[i]! -= ar * x.re[j]! - ai * x.im[j]!
      rIm[i]! -= ar * x.im[j]! + ai * x.re[j]!
      rRe[j]! -= ar * x.re[i]! - ai * x.im[i]!
      rIm[j]! -= ar * x.im[i]! + ai * x.re[i]!
    }
    const d = factor.apply(rRe, rIm)
    for (let i = 0; i < n; i++) {
      x.re[i]! += d.re[i]!
      x.im[i]! += d.im[i]!
    }
    return x
  }

  /**
   * Dense LDLᵀ in index order (node rows first, ideal-source rows last, as the sparse path
   * orders them), then one step of iterative refinement.
   */
  private solveDense(): { re: Vec; im: Vec } {
    const n = this.size
    const aRe = this.denseRe!
    const aIm = this.denseIm!
    const rowScale = zeros(n)
    const diagRe = zeros(n)
    const diagIm = zeros(n)
    for (let i = 0; i < n; i++) {
      let m = 0
      for (let j = 0; j < n; j++) m = Math.max(m, Math.abs(aRe[i * n + j]!) + Math.abs(aIm[i * n + j]!))
      rowScale[i] = m
      diagRe[i] = aRe[i * n + i]!
      diagIm[i] = aIm[i * n + i]!
    }
    // Factorise in the lower triangle only: L (unit) below the diagonal, D on it. The upper
    // triangle is left as stamped, so it still holds the original matrix for the refinement.
    const cRe = zeros(n)
    const cIm = zeros(n)
    for (let k = 0; k < n; k++) {
      let pr = aRe[k * n + k]!
      const pi = aIm[k * n + k]!
      if (k < this.lateFrom && pr < this.nodePivotFloor) aRe[k * n + k] = pr = this.nodePivotFloor
      const pm = pr * pr + pi * pi
      if (!(Math.sqrt(pm) > 1e-15 * rowScale[k]! || (k < this.lateFrom && this.nodePivotFloor > 0)) || !Number.isFinite(pm)) throw new SingularSystemError(k)
      const invRe = pr / pm
      const invIm = -pi / pm
      for (let i = k + 1; i < n; i++) {
        cRe[i] = aRe[i * n + k]!
        cIm[i] = aIm[i * n + k]!
      }
      for (let i = k + 1; i < n; i++) {
        const ar = cRe[i]!
        const ai = cIm[i]!
        if (ar === 0 && ai === 0) continue
        const lr = ar * invRe - ai * invIm
        const li = ar * invIm + ai * invRe
        // A[i][j] −= l_i · A[j][k] for k < j ≤ i
        for (let j = k + 1; j <= i; j++) {
          const br = cRe[j]!
          const bi = cIm[j]!
          if (br === 0 && bi === 0) continue
          aRe[i * n + j]! -= lr * br - li * bi
          aIm[i * n + j]! -= lr * bi + li * br
        }
        aRe[i * n + k] = lr
        aIm[i * n + k] = li
      }
    }
    const apply = (bRe: Vec, bIm: Vec) => {
      const yRe = bRe.slice()
      const yIm = bIm.slice()
      for (let i = 0; i < n; i++) {
        let sr = yRe[i]!
        let si = yIm[i]!
        for (let k = 0; k < i; k++) {
          const lr = aRe[i * n + k]!
          const li = aIm[i * n + k]!
          sr -= lr * yRe[k]! - li * yIm[k]!
          si -= lr * yIm[k]! + li * yRe[k]!
        }
        yRe[i] = sr
        yIm[i] = si
      }
      for (let i = 0; i < n; i++) {
        const dr = aRe[i * n + i]!
        const di = aIm[i * n + i]!
        const dm = dr * dr + di * di
        const yr = yRe[i]!
        const yi = yIm[i]!
        yRe[i] = (yr * dr + yi * di) / dm
        yIm[i] = (yi * dr - yr * di) / dm
      }
      for (let i = n - 1; i >= 0; i--) {
        let sr = yRe[i]!
        let si = yIm[i]!
        for (let k = i + 1; k < n; k++) {
          const lr = aRe[k * n + i]!
          const li = aIm[k * n + i]!
          sr -= lr * yRe[k]! - li * yIm[k]!
          si -= lr * yIm[k]! + li * yRe[k]!
        }
        yRe[i] = sr
        yIm[i] = si
      }
      return { re: yRe, im: yIm }
    }
    const x = apply(this.rhsRe, this.rhsIm)
    // the residual against the original matrix: its diagonal, and its upper triangle
    const rRe = this.rhsRe.slice()
    const rIm = this.rhsIm.slice()
    for (let i = 0; i < n; i++) {
      rRe[i]! -= diagRe[i]! * x.re[i]! - diagIm[i]! * x.im[i]!
      rIm[i]! -= diagRe[i]! * x.im[i]! + diagIm[i]! * x.re[i]!
      for (let j = i + 1; j < n; j++) {
        const ar = aRe[i * n + j]!
        const ai = aIm[i * n + j]!
        if (ar === 0 && ai === 0) continue
        rRe[i]! -= ar * x.re[j]! - ai * x.im[j]!
        rIm[i]! -= ar * x.im[j]! + ai * x.re[j]!
        rRe[j]! -= ar * x.re[i]! - ai * x.im[i]!
        rIm[j]! -= ar * x.im[i]! + ai * x.re[i]!
      }
    }
    const d = apply(rRe, rIm)
    for (let i = 0; i < n; i++) {
      x.re[i]! += d.re[i]!
      x.im[i]! += d.im[i]!
    }
    return x
  }

  private factorise(rowScale: Vec) {
    const n = this.size
    const adjJ = this.adjJ
    const adjS = this.adjS
    const dRe = this.diagRe
    const dIm = this.diagIm
    const offRe = this.offRe
    const offIm = this.offIm
    const order: number[] = new Array<number>(n)
    const colStart: number[] = new Array<number>(n + 1)
    const lIdx: number[] = []
    const lRe: number[] = []
    const lIm: number[] = []
    const eliminated: boolean[] = new Array<boolean>(n).fill(false)
    /** scatter of one row: mark[j] === tag when j is a neighbour, at slot pos[j] */
    const mark: number[] = new Array<number>(n).fill(-1)
    const pos: number[] = new Array<number>(n).fill(0)
    let tag = 0
    const heap = new DegreeHeap()
    const late = new DegreeHeap()
    for (let i = 0; i < n; i++) (i < this.lateFrom ? heap : late).push(adjJ[i]!.length, i)

    // the multipliers of one step (a row has fewer than n neighbours)
    const lr = zeros(n)
    const li = zeros(n)
    for (let step = 0; step < n; step++) {
      let k = -1
      for (;;) {
        const key = heap.pop() ?? late.pop()
        if (key === undefined) break
        const row = key % DegreeHeap.SHIFT
        const degree = (key - row) / DegreeHeap.SHIFT
        if (eliminated[row] || degree !== adjJ[row]!.length) continue
        k = row
        break
      }
      if (k < 0) throw new SingularSystemError(-1)
      order[step] = k
      eliminated[k] = true
      let pr = dRe[k]!
      const pi = dIm[k]!
      if (k < this.lateFrom && pr < this.nodePivotFloor) dRe[k] = pr = this.nodePivotFloor
      const pm = pr * pr + pi * pi
      if (!(Math.sqrt(pm) > 1e-15 * rowScale[k]! || (k < this.lateFrom && this.nodePivotFloor > 0)) || !Number.isFinite(pm)) throw new SingularSystemError(k)
      const invRe = pr / pm
      const invIm = -pi / pm

      const nbr = adjJ[k]!
      const nbrSlot = adjS[k]!
      const m = nbr.length
      colStart[step] = lIdx.length
      for (let a = 0; a < m; a++) {
        const slot = nbrSlot[a]!
        const ar = offRe[slot]!
        const ai = offIm[slot]!
        const xr = ar * invRe - ai * invIm
        const xi = ar * invIm + ai * invRe
        lr[a] = xr
        li[a] = xi
        lIdx.push(nbr[a]!)
        lRe.push(xr)
        lIm.push(xi)
      }
      // k leaves its neighbours' rows (keeping the order of the rest)
      for (let a = 0; a < m; a++) {
        const i = nbr[a]!
        const rj = adjJ[i]!
        const rs = adjS[i]!
        const last = rj.length - 1
        for (let q = rj.indexOf(k); q < last; q++) {
          rj[q] = rj[q + 1]!
          rs[q] = rs[q + 1]!
        }
        rj.pop()
        rs.pop()
      }
      for (let a = 0; a < m; a++) {
        const i = nbr[a]!
        const lar = lr[a]!
        const lai = li[a]!
        // diagonal: A_ii -= l_i · A_ki
        const s0 = nbrSlot[a]!
        dRe[i]! -= lar * offRe[s0]! - lai * offIm[s0]!
        dIm[i]! -= lar * offIm[s0]! + lai * offRe[s0]!
        if (a + 1 >= m) continue
        const rowJ = adjJ[i]!
        const rowS = adjS[i]!
        tag++
        for (let q = 0; q < rowJ.length; q++) {
          mark[rowJ[q]!] = tag
          pos[rowJ[q]!] = rowS[q]!
        }
        for (let b = a + 1; b < m; b++) {
          const j = nbr[b]!
          const sb = nbrSlot[b]!
          const ur = lar * offRe[sb]! - lai * offIm[sb]!
          const ui = lar * offIm[sb]! + lai * offRe[sb]!
          if (mark[j] === tag) {
            const slot = pos[j]!
            offRe[slot]! -= ur
            offIm[slot]! -= ui
          } else {
            const slot = offRe.length
            offRe.push(-ur)
            offIm.push(-ui)
            rowJ.push(j)
            rowS.push(slot)
            adjJ[j]!.push(i)
            adjS[j]!.push(slot)
          }
        }
      }
      for (let a = 0; a < m; a++) {
        const i = nbr[a]!
        ;(i < this.lateFrom ? heap : late).push(adjJ[i]!.length, i)
      }
    }
    colStart[n] = lIdx.length
    const pivRe = dRe.slice()
    const pivIm = dIm.slice()

    return {
      apply(bRe: Vec, bIm: Vec) {
        const yRe = bRe.slice()
        const yIm = bIm.slice()
        for (let step = 0; step < n; step++) {
          const k = order[step]!
          const ykr = yRe[k]!
          const yki = yIm[k]!
          if (ykr === 0 && yki === 0) continue
          for (let p = colStart[step]!; p < colStart[step + 1]!; p++) {
            const i = lIdx[p]!
            yRe[i]! -= lRe[p]! * ykr - lIm[p]! * yki
            yIm[i]! -= lRe[p]! * yki + lIm[p]! * ykr
          }
        }
        for (let k = 0; k < n; k++) {
          const dr = pivRe[k]!
          const di = pivIm[k]!
          const dm = dr * dr + di * di
          const yr = yRe[k]!
          const yi = yIm[k]!
          yRe[k] = (yr * dr + yi * di) / dm
          yIm[k] = (yi * dr - yr * di) / dm
        }
        for (let step = n - 1; step >= 0; step--) {
          const k = order[step]!
          let sr = yRe[k]!
          let si = yIm[k]!
          for (let p = colStart[step]!; p < colStart[step + 1]!; p++) {
            const i = lIdx[p]!
            sr -= lRe[p]! * yRe[i]! - lIm[p]! * yIm[i]!
            si -= lRe[p]! * yIm[i]! + lIm[p]! * yRe[i]!
          }
          yRe[k] = sr
          yIm[k] = si
        }
        return { re: yRe, im: yIm }
      },
    }
  }
}
