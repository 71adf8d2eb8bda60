/**
 * The global newest-vertex-bisection forest (docs/method.md §4.1), grown lazily.
 *
 * Storage is flat and growable. Elements: `dim + 1` vertices each; in 2D counter-clockwise with
 * refinement edge (v0, v1) and newest vertex v2. Bisecting (a, b, c) at the midpoint m of (a, b)
 * gives the children (c, a, m) and (b, c, m), stored consecutively; their refinement edges are the
 * edges opposite m. In 2D the current forest leaves always form one conforming mesh: an element is
 * bisected together with the neighbour across its refinement edge, after bisecting that neighbour
 * first when its refinement edge differs (the usual recursive completion). Neighbour pointers are
 * kept between leaves only. A vertex records its interpolation parents (a, b), its godparents
 * (newest vertices of the one or two elements bisected at it) and its generation.
 *
 * Shape classes (2D): the P1 stiffness of a triangle depends only on its shape up to translation,
 * rotation and scaling, with the vertex order kept. Each element stores a class id; a class is the
 * complex number z = (v2 − v0)/(v1 − v0). Children of class z have classes (z − ½)/z for (c, a, m)
 * and 1/(2(1 − z)) for (b, c, m), so classes of descendants follow without touching coordinates
 * (robust at any depth), and newest-vertex bisection produces only finitely many of them. Element
 * measures are exact: |child| = |parent| / 2.
 *
 * With an anisotropic diffusion tensor K the stiffness also depends on the orientation, so the
 * elements of such a material have *oriented* classes: z, the unit direction d of v1 − v0 and the
 * tensor K/κ (κ its largest eigenvalue). The children's directions are d·(−z)/|z| for (c, a, m) and
 * d·(z − 1)/|z − 1| for (b, c, m); their tensor is the parent's. Newest-vertex bisection also
 * produces only finitely many edge directions, so these classes stay few as well.
 */
import { InvalidMeshError } from '../errors';
import { mappedAnisotropy } from './diffusion-tensor';
import type { BoundaryTables } from './boundary';
import { DIRICHLET_EDGE, type InitialMesh } from './initial-mesh';

export class BisectionForest {
  readonly dim: 1 | 2;
  readonly nv: number; // vertices per element
  readonly initialVertexCount: number;
  readonly initialElementCount: number;
  /** κ per initial element (for an anisotropic one, the largest eigenvalue of its tensor). */
  readonly kappa: Float64Array;
  /** Diffusion tensors (xx, xy, yy per initial element), or null if the domain is isotropic. */
  readonly kappaTensor: Float64Array | null;
  readonly reaction: Float64Array;
  /** Boundary parts per initial boundary edge (./boundary). */
  readonly boundary: BoundaryTables;
  /** The labelled initial mesh the forest grew from (kept for serialisation, see ./forest-log). */
  readonly initialMesh: InitialMesh;

  vertexCount = 0;
  elementCount = 0;

  // vertex data
  vCoord: Float64Array;
  vGen: Int32Array;
  vParentA: Int32Array;
  vParentB: Int32Array;
  vGod0: Int32Array;
  vGod1: Int32Array;
  vFree: Uint8Array;

  // element data
  eVert: Int32Array;
  eNb: Int32Array; // 2D only, 3 per element
  eChild: Int32Array; // first child, −1 for forest leaves
  eMid: Int32Array; // midpoint of the refinement edge, −1 if not bisected
  eGen: Int32Array;
  eMat: Int32Array;
  eShape: Int32Array; // 2D: shape class

  /** Measure (area / length) of each initial element. */
  readonly initialMeasure: Float64Array;
  /** Shape classes: canonical third vertex z (2 per class), child classes (2 per class, −1 unknown). */
  shapeZ: number[] = [];
  shapeChild: number[] = [];
  /** Unit-κ stiffness of each class: k00 k01 k02 k11 k12 k22 (for an oriented class, with K/κ). */
  shapeK: number[] = [];
  /** Oriented classes: direction of v1 − v0 (2 per class, 0 for plain classes) and tensor id (−1 for plain). */
  private shapeDir: number[] = [];
  private shapeTensor: number[] = [];
  /** Distinct normalized tensors K/κ, 3 per id, and the id of each initial element (−1 if isotropic). */
  private tensorUnit: number[] = [];
  private readonly materialTensor: Int32Array;
  private shapeIndex = new Map<string, number>();

  constructor(init: InitialMesh) {
    this.dim = init.dim;
    this.nv = init.dim + 1;
    const d = this.dim;
    const nvInit = init.coords.length / d;
    const neInit = init.elements.length / this.nv;
    this.initialVertexCount = nvInit;
    this.initialElementCount = neInit;
    this.kappa = init.kappa;
    this.kappaTensor = init.kappaTensor;
    this.reaction = init.reaction;
    this.boundary = init.boundary;
    this.initialMesh = init;
    const vc = Math.max(16, 2 * nvInit);
    const ec = Math.max(16, 2 * neInit);
    this.vCoord = new Float64Array(vc * d);
    this.vGen = new Int32Array(vc);
    this.vParentA = new Int32Array(vc);
    this.vParentB = new Int32Array(vc);
    this.vGod0 = new Int32Array(vc);
    this.vGod1 = new Int32Array(vc);
    this.vFree = new Uint8Array(vc);
    this.eVert = new Int32Array(ec * this.nv);
    this.eNb = new Int32Array(d === 2 ? ec * 3 : 0);
    this.eChild = new Int32Array(ec);
    this.eMid = new Int32Array(ec);
    this.eGen = new Int32Array(ec);
    this.eMat = new Int32Array(ec);
    this.eShape = new Int32Array(d === 2 ? ec : 0);
    this.initialMeasure = new Float64Array(neInit);
    this.materialTensor = this.unitTensors(init);
    this.vCoord.set(init.coords);
    for (let i = 0; i < nvInit; i++) {
      this.vParentA[i] = this.vParentB[i] = this.vGod0[i] = this.vGod1[i] = -1;
      this.vFree[i] = init.vertexFree[i]!;
    }
    this.vertexCount = nvInit;
    this.eVert.set(init.elements);
    if (d === 2) this.eNb.set(init.neighbors);
    for (let e = 0; e < neInit; e++) {
      this.eChild[e] = -1;
      this.eMid[e] = -1;
      this.eMat[e] = e;
      const ev = init.elements, c = init.coords;
      if (d === 1) this.initialMeasure[e] = Math.abs(c[ev[2 * e + 1]!]! - c[ev[2 * e]!]!);
      else {
        const p = ev[3 * e]!, q = ev[3 * e + 1]!, r = ev[3 * e + 2]!;
        const ax = c[2 * q]! - c[2 * p]!, ay = c[2 * q + 1]! - c[2 * p + 1]!;
        const bx = c[2 * r]! - c[2 * p]!, by = c[2 * r + 1]! - c[2 * p + 1]!;
        this.initialMeasure[e] = 0.5 * (ax * by - ay * bx);
        // z = (v2 − v0) / (v1 − v0)
        const den = ax * ax + ay * ay;
        const len = Math.sqrt(den);
        this.eShape[e] = this.shapeOf((bx * ax + by * ay) / den, (by * ax - bx * ay) / den, ax / len, ay / len, this.materialTensor[e]!);
      }
    }
    this.elementCount = neInit;
  }

  /** Ids of the distinct normalized tensors K/κ per initial element (−1 everywhere for an isotropic domain). */
  private unitTensors(init: InitialMesh): Int32Array {
    const ne = init.kappa.length;
    const ids = new Int32Array(ne).fill(-1);
    const t = init.kappaTensor;
    if (t === null || init.dim !== 2) return ids;
    const byKey = new Map<string, number>();
    for (let e = 0; e < ne; e++) {
      const k = init.kappa[e]!;
      const xx = t[3 * e]! / k, xy = t[3 * e + 1]! / k, yy = t[3 * e + 2]! / k;
      const key = `${xx},${xy},${yy}`;
      let id = byKey.get(key);
      if (id === undefined) {
        id = this.tensorUnit.length / 3;
        byKey.set(key, id);
        this.tensorUnit.push(xx, xy, yy);
      }
      ids[e] = id;
    }
    return ids;
  }

  /**
   * Class id of the canonical shape z = x + iy, with direction (dx, dy) of v1 − v0 and normalized
   * tensor `tensor` for an oriented class (tensor ≥ 0), registered on first use.
   */
  private shapeOf(x: number, y: number, dx: number, dy: number, tensor: number): number {
    const r = (v: number): number => Math.round(v * 2 ** 40);
    const key = tensor < 0 ? `${r(x)},${r(y)}` : `${r(x)},${r(y)},${r(dx)},${r(dy)},${tensor}`;
    let id = this.shapeIndex.get(key);
    if (id === undefined) {
      id = this.shapeZ.length / 2;
      this.shapeIndex.set(key, id);
      this.shapeZ.push(x, y);
      this.shapeChild.push(-1, -1);
      if (tensor < 0) {
        // triangle (0, 0), (1, 0), (x, y): b = (−y, y, 0), c = (x − 1, −x, 1), 4|T| = 2y
        const b0 = -y, b1 = y, c0 = x - 1, c1 = -x, s = 1 / (2 * y);
        this.shapeK.push(s * (b0 * b0 + c0 * c0), s * (b0 * b1 + c0 * c1), s * c0, s * (b1 * b1 + c1 * c1), s * c1, s);
        this.shapeDir.push(0, 0); // unused: plain classes do not depend on the direction
      } else {
        // triangle (0, 0), d, z·d (|d| = 1, so 4|T| = 2y); b_i = y_{i+1} − y_{i+2}, c_i = x_{i+2} − x_{i+1},
        // entries g_iᵀ (K/κ) g_j / (4|T|) with g = (b, c) (element-matrices.ts)
        const x1 = dx, y1 = dy, x2 = x * dx - y * dy, y2 = x * dy + y * dx;
        const b = [y1 - y2, y2, -y1], c = [x2 - x1, -x2, x1];
        const txx = this.tensorUnit[3 * tensor]!, txy = this.tensorUnit[3 * tensor + 1]!, tyy = this.tensorUnit[3 * tensor + 2]!;
        const s = 1 / (2 * y);
        const k = (i: number, j: number): number => s * (txx * b[i]! * b[j]! + txy * (b[i]! * c[j]! + c[i]! * b[j]!) + tyy * c[i]! * c[j]!);
        this.shapeK.push(k(0, 0), k(0, 1), k(0, 2), k(1, 1), k(1, 2), k(2, 2));
        this.shapeDir.push(dx, dy);
      }
      this.shapeTensor.push(tensor);
    }
    return id;
  }

  /**
   * The largest mapped anisotropy (./diffusion-tensor.ts) over the classes of the initial elements
   * and of all their descendants: the closure of each initial class under bisection (finitely many
   * classes, registered here if not met yet). Isotropic classes count with K = I: a flat triangle
   * under a scalar κ is to the V-cycles what a fat one is under a strongly anisotropic K
   * (docs/adaptivity.md §2.6). The largest value; the cycles go by the bulk of the mesh and take
   * 2 where only a few elements are flatter (innerCycles in ./flat-elements). 1 in 1D.
   */
  mappedAnisotropy(): number {
    let worst = 1;
    for (const a of this.initialMappedAnisotropy()) worst = Math.max(worst, a);
    return worst;
  }

  /** Whether initial element e has an anisotropic material (a diffusion tensor). */
  isAnisotropicElement(e: number): boolean {
    return this.materialTensor[e]! >= 0;
  }

  /** Per initial element, the largest mapped anisotropy over its class and its descendants' (empty in 1D). */
  initialMappedAnisotropy(): Float64Array {
    const n = this.dim === 2 ? this.initialElementCount : 0;
    const out = new Float64Array(n);
    const byClass = new Map<number, number>(); // the initial classes repeat (a structured mesh has two)
    for (let e = 0; e < n; e++) {
      const c0 = this.eShape[e]!;
      let worst = byClass.get(c0);
      if (worst === undefined) {
        worst = 1;
        const seen = new Set<number>();
        const stack = [c0];
        while (stack.length > 0) {
          const c = stack.pop()!;
          if (seen.has(c)) continue;
          seen.add(c);
          worst = Math.max(worst, this.classAnisotropy(c));
          stack.push(this.childShape(c, 0), this.childShape(c, 1));
        }
        byClass.set(c0, worst);
      }
      out[e] = worst;
    }
    return out;
  }

  /** Mapped anisotropy of one class: its triangle (0, 0), d, z·d under its normalized tensor (K = I if isotropic). */
  private classAnisotropy(c: number): number {
    const x = this.shapeZ[2 * c]!, y = this.shapeZ[2 * c + 1]!;
    const t = this.shapeTensor[c]!;
    if (t < 0) return mappedAnisotropy(1, 0, x, y, 1, 0, 1);
    const dx = this.shapeDir[2 * c]!, dy = this.shapeDir[2 * c + 1]!;
    return mappedAnisotropy(dx, dy, x * dx - y * dy, x * dy + y * dx, this.tensorUnit[3 * t]!, this.tensorUnit[3 * t + 1]!, this.tensorUnit[3 * t + 2]!);
  }

  /** Class of child k (0: (c, a, m), 1: (b, c, m)) of an element of class `shape`. */
  childShape(shape: number, k: number): number {
    const known = this.shapeChild[2 * shape + k]!;
    if (known >= 0) return known;
    const x = this.shapeZ[2 * shape]!, y = this.shapeZ[2 * shape + 1]!;
    let cx: number, cy: number;
    // w: the child's first edge over the parent's, −z for (c, a, m) and z − 1 for (b, c, m)
    let wx: number, wy: number;
    if (k === 0) {
      // (z − ½) / z
      const den = x * x + y * y;
      cx = ((x - 0.5) * x + y * y) / den;
      cy = (y * x - (x - 0.5) * y) / den;
      wx = -x;
      wy = -y;
    } else {
      // 1 / (2 (1 − z))
      const ux = 2 * (1 - x), uy = -2 * y, den = ux * ux + uy * uy;
      cx = ux / den;
      cy = -uy / den;
      wx = x - 1;
      wy = y;
    }
    const tensor = this.shapeTensor[shape]!;
    let dx = 0, dy = 0;
    if (tensor >= 0) {
      const px = this.shapeDir[2 * shape]!, py = this.shapeDir[2 * shape + 1]!;
      const wl = Math.hypot(wx, wy);
      dx = (px * wx - py * wy) / wl;
      dy = (px * wy + py * wx) / wl;
    }
    const id = this.shapeOf(cx, cy, dx, dy, tensor);
    this.shapeChild[2 * shape + k] = id;
    return id;
  }

  /** Vertex capacity (all per-vertex scratch arrays elsewhere must be at least this long). */
  get vertexCapacity(): number {
    return this.vGen.length;
  }

  private growVertices(): void {
    const cap = this.vGen.length * 2;
    const g = <T extends Int32Array | Float64Array | Uint8Array>(a: T, n: number): T => {
      const b = new (a.constructor as new (n: number) => T)(n);
      b.set(a);
      return b;
    };
    this.vCoord = g(this.vCoord, cap * this.dim);
    this.vGen = g(this.vGen, cap);
    this.vParentA = g(this.vParentA, cap);
    this.vParentB = g(this.vParentB, cap);
    this.vGod0 = g(this.vGod0, cap);
    this.vGod1 = g(this.vGod1, cap);
    this.vFree = g(this.vFree, cap);
  }

  private growElements(): void {
    const cap = this.eChild.length * 2;
    const g = <T extends Int32Array>(a: T, n: number): T => {
      const b = new Int32Array(n) as T;
      b.set(a);
      return b;
    };
    this.eVert = g(this.eVert, cap * this.nv);
    if (this.dim === 2) this.eNb = g(this.eNb, cap * 3);
    this.eChild = g(this.eChild, cap);
    this.eMid = g(this.eMid, cap);
    this.eGen = g(this.eGen, cap);
    this.eMat = g(this.eMat, cap);
    if (this.dim === 2) this.eShape = g(this.eShape, cap);
  }

  private newVertex(a: number, b: number, gen: number, god0: number, god1: number, free: number): number {
    if (this.vertexCount === this.vGen.length) this.growVertices();
    const m = this.vertexCount++;
    const d = this.dim;
    for (let k = 0; k < d; k++) this.vCoord[m * d + k] = 0.5 * (this.vCoord[a * d + k]! + this.vCoord[b * d + k]!);
    this.vGen[m] = gen;
    this.vParentA[m] = a;
    this.vParentB[m] = b;
    this.vGod0[m] = god0;
    this.vGod1[m] = god1;
    this.vFree[m] = free;
    return m;
  }

  /** Appends two child elements of `e` (vertices given) and returns the first child's id. */
  private newChildren(e: number, c0: number, c1: number, c2: number, d0: number, d1: number, d2: number): number {
    if (this.elementCount + 2 > this.eChild.length) this.growElements();
    const f = this.elementCount;
    this.elementCount += 2;
    const nv = this.nv;
    const gen = this.eGen[e]! + 1;
    const mat = this.eMat[e]!;
    for (let k = 0; k < 2; k++) {
      this.eChild[f + k] = -1;
      this.eMid[f + k] = -1;
      this.eGen[f + k] = gen;
      this.eMat[f + k] = mat;
    }
    const ev = this.eVert;
    ev[f * nv] = c0;
    ev[f * nv + 1] = c1;
    if (nv === 3) {
      ev[f * nv + 2] = c2;
      ev[f * nv + 3] = d0;
      ev[f * nv + 4] = d1;
      ev[f * nv + 5] = d2;
      const sh = this.eShape[e]!;
      this.eShape[f] = this.childShape(sh, 0);
      this.eShape[f + 1] = this.childShape(sh, 1);
    } else {
      ev[f * nv + 2] = d0;
      ev[f * nv + 3] = d1;
    }
    this.eChild[e] = f;
    return f;
  }

  /** Bisects forest element `e` (if not yet done) and returns the midpoint of its refinement edge. */
  bisect(e: number): number {
    if (this.eChild[e]! >= 0) return this.eMid[e]!;
    if (this.dim === 1) {
      const a = this.eVert[2 * e]!, b = this.eVert[2 * e + 1]!;
      const ga = this.vGen[a]!, gb = this.vGen[b]!;
      const god = ga > gb || (ga === gb && a > b) ? a : b;
      const m = this.newVertex(a, b, this.eGen[e]! + 1, god, -1, 1);
      this.newChildren(e, a, m, 0, m, b, 0);
      this.eMid[e] = m;
      return m;
    }
    for (let guard = 0; ; guard++) {
      if (guard > 4096) {
        throw new InvalidMeshError(`newest-vertex bisection did not terminate at element ${e} (inconsistent labelling)`, {
          field: 'forest',
          expected: 'terminating refinement',
          received: e,
        });
      }
      const n = this.eNb[3 * e + 2]!;
      if (n < 0) return this.split(e, n);
      if (this.eNb[3 * n + 2] === e) return this.split(e, n);
      this.bisect(n); // afterwards the neighbour across (a, b) is a child of n
    }
  }

  private replaceNeighbor(x: number, oldE: number, newE: number): void {
    if (x < 0) return;
    const nb = this.eNb;
    for (let k = 0; k < 3; k++) {
      if (nb[3 * x + k] === oldE) {
        nb[3 * x + k] = newE;
        return;
      }
    }
  }

  /** Bisects e (and its compatible neighbour n ≥ 0, or boundary code n < 0) at one new midpoint. */
  private split(e: number, n: number): number {
    const ev = this.eVert;
    const a = ev[3 * e]!, b = ev[3 * e + 1]!, c = ev[3 * e + 2]!;
    const d = n >= 0 ? ev[3 * n + 2]! : -1;
    let gen = this.eGen[e]!;
    if (n >= 0 && this.eGen[n]! > gen) gen = this.eGen[n]!;
    if (this.vGen[a]! > gen) gen = this.vGen[a]!;
    if (this.vGen[b]! > gen) gen = this.vGen[b]!;
    const free = n === DIRICHLET_EDGE ? 0 : 1;
    const m = this.newVertex(a, b, gen + 1, c, d, free);
    const eb0 = this.eNb[3 * e]!, eb1 = this.eNb[3 * e + 1]!;
    const t = this.newChildren(e, c, a, m, b, c, m); // T1 = (c, a, m), T2 = (b, c, m)
    this.eMid[e] = m;
    const nb = this.eNb;
    const t1 = t, t2 = t + 1;
    // T1: [0] = (a, m), [1] = (m, c) ↔ T2, [2] = (c, a) = old edge opposite b.
    // T2: [0] = (c, m) ↔ T1, [1] = (m, b), [2] = (b, c) = old edge opposite a.
    nb[3 * t1 + 1] = t2;
    nb[3 * t1 + 2] = eb1;
    nb[3 * t2] = t1;
    nb[3 * t2 + 2] = eb0;
    this.replaceNeighbor(eb1, e, t1);
    this.replaceNeighbor(eb0, e, t2);
    if (n >= 0) {
      // n = (b, a, d): N1 = (d, b, m), N2 = (a, d, m).
      const nb0 = this.eNb[3 * n]!, nb1 = this.eNb[3 * n + 1]!;
      const u = this.newChildren(n, d, b, m, a, d, m);
      this.eMid[n] = m;
      const nb2 = this.eNb;
      const n1 = u, n2 = u + 1;
      nb2[3 * n1] = t2; // (b, m)
      nb2[3 * n1 + 1] = n2; // (m, d)
      nb2[3 * n1 + 2] = nb1; // (d, b)
      nb2[3 * n2] = n1; // (d, m)
      nb2[3 * n2 + 1] = t1; // (m, a)
      nb2[3 * n2 + 2] = nb0; // (a, d)
      this.replaceNeighbor(nb1, n, n1);
      this.replaceNeighbor(nb0, n, n2);
      nb2[3 * t1] = n2;
      nb2[3 * t2 + 1] = n1;
    } else {
      // Both halves of a boundary edge keep its code (Dirichlet, insulated or natural edge b).
      this.eNb[3 * t1] = n;
      this.eNb[3 * t2 + 1] = n;
    }
    return m;
  }
}
