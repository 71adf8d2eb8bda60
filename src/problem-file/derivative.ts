/**
 * Exact partial derivatives of problem-file expressions by symbolic differentiation of their
 * syntax trees (sum, product, quotient and chain rules; common practice), compiled like the
 * expressions themselves. Used for the `exact` field: the gradient of a known solution for the
 * error norms, and ∂t u, Δu, ∇κ to check that it solves the stated problem.
 *
 * Piecewise parts differentiate piecewise: a comparison or logical operator is constant where it
 * does not jump (derivative 0), `a ? b : c` gives `a ? b' : c'`, abs, min and max follow the
 * branch they take. Where a function is not differentiable (abs at 0, sqrt at 0) the result is the
 * one-sided or infinite value the formula gives, as a hand derivation would.
 */
import type jsep from 'jsep';
import { FUNCTIONS, compileTree, parseExpression, type CompiledExpression, type ExpressionTree, type ExpressionVariable } from './expression';

type Node = ExpressionTree;

const num = (value: number): Node => ({ type: 'Literal', value, raw: String(value) }) as Node;
const ZERO = num(0);
const ONE = num(1);
const isNum = (n: Node, v: number): boolean => n.type === 'Literal' && (n as jsep.Literal).value === v;
const bin = (operator: string, left: Node, right: Node): Node => ({ type: 'BinaryExpression', operator, left, right }) as Node;
const call = (name: string, ...args: Node[]): Node => ({ type: 'CallExpression', callee: { type: 'Identifier', name }, arguments: args }) as Node;
const cond = (test: Node, consequent: Node, alternate: Node): Node => ({ type: 'ConditionalExpression', test, consequent, alternate }) as Node;

function neg(a: Node): Node {
  if (isNum(a, 0)) return ZERO;
  return { type: 'UnaryExpression', operator: '-', argument: a, prefix: true } as Node;
}
function add(a: Node, b: Node): Node {
  if (isNum(a, 0)) return b;
  if (isNum(b, 0)) return a;
  return bin('+', a, b);
}
function sub(a: Node, b: Node): Node {
  if (isNum(b, 0)) return a;
  if (isNum(a, 0)) return neg(b);
  return bin('-', a, b);
}
function mul(a: Node, b: Node): Node {
  if (isNum(a, 0) || isNum(b, 0)) return ZERO;
  if (isNum(a, 1)) return b;
  if (isNum(b, 1)) return a;
  return bin('*', a, b);
}
function div(a: Node, b: Node): Node {
  if (isNum(a, 0)) return ZERO;
  if (isNum(b, 1)) return a;
  return bin('/', a, b);
}

/**
 * The tree in the operator conventions of the compiler, so that differentiation sees what the
 * compiler evaluates: `−a^b` is `−(a^b)` (jsep binds unary minus tighter), `**` and `pow(a, b)`
 * are `a^b`.
 */
function normalize(node: Node): Node {
  switch (node.type) {
    case 'UnaryExpression': {
      const u = node as jsep.UnaryExpression;
      return { ...node, argument: normalize(u.argument) } as Node;
    }
    case 'BinaryExpression': {
      const b = node as jsep.BinaryExpression;
      const pow = b.operator === '^' || b.operator === '**';
      if (pow && b.left.type === 'UnaryExpression' && ['-', '+'].includes((b.left as jsep.UnaryExpression).operator)) {
        const u = b.left as jsep.UnaryExpression;
        const inner = bin('^', normalize(u.argument), normalize(b.right));
        return u.operator === '-' ? ({ type: 'UnaryExpression', operator: '-', argument: inner, prefix: true } as Node) : inner;
      }
      return bin(pow ? '^' : b.operator, normalize(b.left), normalize(b.right));
    }
    case 'ConditionalExpression': {
      const c = node as jsep.ConditionalExpression;
      return cond(normalize(c.test), normalize(c.consequent), normalize(c.alternate));
    }
    case 'CallExpression': {
      const c = node as jsep.CallExpression;
      const args = c.arguments.map(normalize);
      const name = c.callee.type === 'Identifier' ? (c.callee as jsep.Identifier).name : '';
      if (name === 'pow' && args.length === 2) return bin('^', args[0]!, args[1]!);
      return { ...node, arguments: args } as Node;
    }
    default:
      return node;
  }
}

/** ∂(node)/∂v as a tree (node normalized). Unknown constructs are left to the compiler to reject. */
function differentiate(node: Node, v: ExpressionVariable): Node {
  switch (node.type) {
    case 'Literal':
      return ZERO;
    case 'Identifier':
      return (node as jsep.Identifier).name === v ? ONE : ZERO;
    case 'UnaryExpression': {
      const u = node as jsep.UnaryExpression;
      if (u.operator === '-') return neg(differentiate(u.argument, v));
      if (u.operator === '+') return differentiate(u.argument, v);
      return ZERO; // '!' is piecewise constant
    }
    case 'BinaryExpression': {
      const { operator: op, left: a, right: b } = node as jsep.BinaryExpression;
      const da = () => differentiate(a, v);
      const db = () => differentiate(b, v);
      switch (op) {
        case '+': return add(da(), db());
        case '-': return sub(da(), db());
        case '*': return add(mul(da(), b), mul(a, db()));
        case '/': return sub(div(da(), b), div(mul(a, db()), mul(b, b)));
        case '^': {
          const dExp = db();
          // b constant in v: b·a^(b−1)·a'; otherwise a^b·(b'·log a + b·a'/a)
          if (isNum(dExp, 0)) return mul(mul(b, bin('^', a, sub(b, ONE))), da());
          return mul(node, add(mul(dExp, call('log', a)), div(mul(b, da()), a)));
        }
        default:
          return ZERO; // comparisons and logical operators are piecewise constant
      }
    }
    case 'ConditionalExpression': {
      const c = node as jsep.ConditionalExpression;
      return cond(c.test, differentiate(c.consequent, v), differentiate(c.alternate, v));
    }
    case 'CallExpression': {
      const c = node as jsep.CallExpression;
      const name = c.callee.type === 'Identifier' ? (c.callee as jsep.Identifier).name : '';
      if (!(name in FUNCTIONS) || c.arguments.length !== FUNCTIONS[name]!.arity) return node; // rejected when compiled
      const [a, b] = c.arguments as [Node, Node];
      const da = differentiate(a, v);
      switch (name) {
        case 'sin': return mul(call('cos', a), da);
        case 'cos': return neg(mul(call('sin', a), da));
        case 'tan': return div(da, bin('^', call('cos', a), num(2)));
        case 'exp': return mul(node, da);
        case 'log': return div(da, a);
        case 'sqrt': return div(da, mul(num(2), node));
        case 'abs': return mul(da, cond(bin('>', a, ZERO), ONE, cond(bin('<', a, ZERO), num(-1), ZERO)));
        case 'atan2': {
          // atan2(a, b) = angle of (b, a): (b·a' − a·b') / (a² + b²)
          const dbb = differentiate(b, v);
          return div(sub(mul(b, da), mul(a, dbb)), add(bin('^', a, num(2)), bin('^', b, num(2))));
        }
        case 'min': return cond(bin('<=', a, b), da, differentiate(b, v));
        case 'max': return cond(bin('>=', a, b), da, differentiate(b, v));
        default: return node;
      }
    }
    default:
      return node; // rejected when compiled
  }
}

/**
 * Compiles `source` and the partial derivatives named in `derivatives` (each a list of variables:
 * `['x']` is ∂/∂x, `['x', 'x']` is ∂²/∂x²), with the usual checks and error messages of
 * {@link compileExpression}. A derivative's `source` reads `∂x∂x(…)`.
 *
 * @example
 * ```ts
 * import { compileWithDerivatives } from 'chronomesh/problem-file';
 * const [u, ux, uxx] = compileWithDerivatives('sin(pi*x)*exp(-t)', 'exact', ['t', 'x'], [['x'], ['x', 'x']]);
 * console.log(u!.fn(0, 0.5, 0), ux!.fn(0, 0, 0), uxx!.fn(0, 0.5, 0)); // → 1 3.141592653589793 -9.869604401089358
 * ```
 */
export function compileWithDerivatives(
  source: string, field: string, variables: readonly ExpressionVariable[], derivatives: readonly (readonly ExpressionVariable[])[],
): CompiledExpression[] {
  const tree = parseExpression(source, field);
  const out = [compileTree(tree, source, field, variables)]; // rejects what the language does not allow
  const base = normalize(tree);
  for (const wrt of derivatives) {
    let d = base;
    for (const v of wrt) d = differentiate(d, v);
    out.push(compileTree(d, `∂${wrt.join('∂')}(${source})`, field, variables));
  }
  return out;
}
