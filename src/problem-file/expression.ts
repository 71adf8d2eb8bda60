/**
 * Arithmetic expressions of problem files, e.g. `"40*exp(-((x+0.5)^2+(y-0.5)^2)/0.02)*(t >= 0.25)"`.
 *
 * Parsing is done by jsep (a small, well-kept JavaScript-expression parser that only builds a
 * syntax tree and never executes anything); this module accepts a fixed subset of that tree
 * (numbers, the variables allowed for the field, pi, e, + − * / ^, comparisons, && || !, a ? b : c
 * and a fixed list of Math functions) and compiles it once into a tree of closures over
 * (t, x, y). No `eval`, no `new Function`, no property access: anything else is rejected with
 * the column where it occurs. Constant subtrees are folded at compile time.
 *
 * Conventions (common practice in mathematical notation, not JavaScript's): `^` is power and
 * right-associative (2^3^2 = 2^9), unary minus binds weaker than `^` (−x^2 = −(x^2)),
 * comparisons and logical operators give 1 or 0, and `a ? b : c` takes b when a ≠ 0.
 */
import jsep from 'jsep';
import { InvalidArgumentError } from '../errors';
import { nearestName } from './nearest-name';

/** A compiled expression: `fn(t, x, y)` (unused variables are ignored). */
export interface CompiledExpression {
  readonly source: string;
  readonly fn: (t: number, x: number, y: number) => number;
  /** True when the expression does not depend on any variable. */
  readonly constant: boolean;
}

/** Variable names an expression may use. */
export type ExpressionVariable = 't' | 'x' | 'y';

type Fn = (t: number, x: number, y: number) => number;
/** A syntax tree of an expression (jsep's). @internal */
export type ExpressionTree = jsep.Expression;
type Node = ExpressionTree;

// '^' as power: above * and /, right-associative (jsep's default '^' is bitwise xor).
jsep.addBinaryOp('^', 11, true);

/** The functions an expression may call, with their arity. @internal */
export const FUNCTIONS: Record<string, { arity: number; f: (...a: number[]) => number }> = {
  sin: { arity: 1, f: Math.sin }, cos: { arity: 1, f: Math.cos }, tan: { arity: 1, f: Math.tan },
  exp: { arity: 1, f: Math.exp }, log: { arity: 1, f: Math.log }, sqrt: { arity: 1, f: Math.sqrt },
  abs: { arity: 1, f: Math.abs }, atan2: { arity: 2, f: Math.atan2 }, pow: { arity: 2, f: Math.pow },
  min: { arity: 2, f: Math.min }, max: { arity: 2, f: Math.max },
};
const CONSTANTS: Record<string, number> = { pi: Math.PI, e: Math.E };
const BINARY = new Set(['+', '-', '*', '/', '^', '**', '<', '<=', '>', '>=', '==', '!=', '&&', '||']);

interface Compiled {
  fn: Fn;
  /** Set when the subtree is constant. */
  value: number | null;
}

function fail(field: string, source: string, message: string, column?: number): never {
  const at = column !== undefined ? ` (column ${column + 1})` : '';
  throw new InvalidArgumentError(`${field}: ${message}${at} in ${JSON.stringify(source)}`, { field, received: source });
}

/**
 * Parses and compiles `source` once; the result evaluates with no allocation.
 *
 * @param field - name used in error messages (e.g. `"source"`).
 * @param variables - the variables the expression may use.
 * @example
 * ```ts
 * import { compileExpression } from 'chronomesh/problem-file';
 * const f = compileExpression('2*x^2 + (t > 1 ? 1 : 0)', 'source', ['t', 'x', 'y']);
 * console.log(f.fn(2, 3, 0)); // → 19
 * ```
 */
export function compileExpression(source: string, field: string, variables: readonly ExpressionVariable[]): CompiledExpression {
  if (typeof source === 'number') source = String(source);
  return compileTree(parseExpression(source, field), source, field, variables);
}

/** The syntax tree of `source`, or an error naming `field` and the column. @internal */
export function parseExpression(source: string, field: string): Node {
  if (typeof source !== 'string') fail(field, String(source), 'must be an expression string or a number');
  if (source.trim() === '') fail(field, source, 'is empty');
  try {
    return jsep(source);
  } catch (e) {
    const err = e as { description?: string; index?: number; message: string };
    return fail(field, source, `does not parse: ${err.description ?? err.message}`, err.index);
  }
}

/**
 * Compiles a syntax tree of {@link parseExpression} (or one derived from it, ./derivative.ts);
 * `source` is what error messages and the result show. @internal
 */
export function compileTree(ast: Node, source: string, field: string, variables: readonly ExpressionVariable[]): CompiledExpression {
  const c = compile(ast, { field, source, allowed: new Set<string>(variables) });
  return { source, fn: c.fn, constant: c.value !== null };
}

interface Ctx {
  field: string;
  source: string;
  allowed: Set<string>;
}

function constant(v: number): Compiled {
  return { fn: () => v, value: v };
}

function compile(node: Node, ctx: Ctx): Compiled {
  switch (node.type) {
    case 'Literal': {
      const v = (node as jsep.Literal).value;
      if (typeof v !== 'number') fail(ctx.field, ctx.source, `only numbers are allowed, found ${JSON.stringify(v)}`);
      return constant(v);
    }
    case 'Identifier': {
      const name = (node as jsep.Identifier).name;
      if (name in CONSTANTS) return constant(CONSTANTS[name]!);
      if (ctx.allowed.has(name)) {
        if (name === 't') return { fn: (t) => t, value: null };
        if (name === 'x') return { fn: (_t, x) => x, value: null };
        return { fn: (_t, _x, y) => y, value: null };
      }
      const known = [...ctx.allowed, ...Object.keys(CONSTANTS)];
      const isVar = ['t', 'x', 'y'].includes(name);
      const hint = isVar ? null : nearestName(name, known);
      const vars = isVar ? ` (${ctx.field} may depend on ${[...ctx.allowed].join(', ') || 'no variable'} only)` : '';
      return fail(ctx.field, ctx.source, `unknown name '${name}'${vars}${hint ? `; did you mean '${hint}'?` : ''}`);
    }
    case 'UnaryExpression': {
      const u = node as jsep.UnaryExpression;
      const a = compile(u.argument, ctx);
      if (u.operator === '+') return a;
      if (u.operator === '-') {
        const f = a.fn;
        return a.value !== null ? constant(-a.value) : { fn: (t, x, y) => -f(t, x, y), value: null };
      }
      if (u.operator === '!') {
        const f = a.fn;
        return a.value !== null ? constant(a.value === 0 ? 1 : 0) : { fn: (t, x, y) => (f(t, x, y) === 0 ? 1 : 0), value: null };
      }
      return fail(ctx.field, ctx.source, `operator '${u.operator}' is not supported`);
    }
    case 'BinaryExpression': {
      const b = node as jsep.BinaryExpression;
      if (!BINARY.has(b.operator)) return fail(ctx.field, ctx.source, `operator '${b.operator}' is not supported`);
      const pow = b.operator === '^' || b.operator === '**';
      // −a^b means −(a^b): jsep binds unary minus tighter, so rotate it out.
      if (pow && b.left.type === 'UnaryExpression' && ['-', '+'].includes((b.left as jsep.UnaryExpression).operator)) {
        const u = b.left as jsep.UnaryExpression;
        return compile({ type: 'UnaryExpression', operator: u.operator, prefix: true, argument: { ...b, left: u.argument } } as Node, ctx);
      }
      return binary(pow ? '^' : b.operator, compile(b.left, ctx), compile(b.right, ctx));
    }
    case 'ConditionalExpression': {
      const c = node as jsep.ConditionalExpression;
      const p = compile(c.test, ctx), a = compile(c.consequent, ctx), q = compile(c.alternate, ctx);
      if (p.value !== null) return p.value !== 0 ? a : q;
      const pf = p.fn, af = a.fn, qf = q.fn;
      return { fn: (t, x, y) => (pf(t, x, y) !== 0 ? af(t, x, y) : qf(t, x, y)), value: null };
    }
    case 'CallExpression': {
      const call = node as jsep.CallExpression;
      if (call.callee.type !== 'Identifier') return fail(ctx.field, ctx.source, 'only calls of named functions are allowed');
      const name = (call.callee as jsep.Identifier).name;
      const spec = FUNCTIONS[name];
      if (!spec) {
        const hint = nearestName(name, Object.keys(FUNCTIONS));
        return fail(ctx.field, ctx.source, `unknown function '${name}'${hint ? `; did you mean '${hint}'?` : ''} (known: ${Object.keys(FUNCTIONS).join(' ')})`);
      }
      if (call.arguments.length !== spec.arity) {
        return fail(ctx.field, ctx.source, `${name} takes ${spec.arity} argument${spec.arity > 1 ? 's' : ''}, found ${call.arguments.length}`);
      }
      const args = call.arguments.map((a) => compile(a, ctx));
      const f = spec.f;
      if (args.every((a) => a.value !== null)) return constant(f(...args.map((a) => a.value!)));
      if (spec.arity === 1) {
        const g = args[0]!.fn;
        return { fn: (t, x, y) => f(g(t, x, y)), value: null };
      }
      const g = args[0]!.fn, h = args[1]!.fn;
      if (name === 'pow') return binary('^', args[0]!, args[1]!);
      return { fn: (t, x, y) => f(g(t, x, y), h(t, x, y)), value: null };
    }
    case 'Compound':
      return fail(ctx.field, ctx.source, 'is more than one expression (a missing operator?)');
    default:
      return fail(ctx.field, ctx.source, `${describeNode(node)} is not allowed (only numbers, t/x/y, pi, e, operators and functions)`);
  }
}

function describeNode(node: Node): string {
  switch (node.type) {
    case 'MemberExpression': return 'property access';
    case 'ArrayExpression': return 'an array';
    case 'ThisExpression': return "'this'";
    default: return String(node.type);
  }
}

/** Binary operation with constant folding and specializations for a constant operand. */
function binary(op: string, a: Compiled, b: Compiled): Compiled {
  const f = BINARY_FNS[op]!;
  if (a.value !== null && b.value !== null) return constant(f(a.value, b.value));
  const g = a.fn, h = b.fn;
  if (op === '^' && b.value === 2) return { fn: (t, x, y) => { const v = g(t, x, y); return v * v; }, value: null };
  if (b.value !== null) {
    const k = b.value;
    switch (op) {
      case '+': return { fn: (t, x, y) => g(t, x, y) + k, value: null };
      case '-': return { fn: (t, x, y) => g(t, x, y) - k, value: null };
      case '*': return { fn: (t, x, y) => g(t, x, y) * k, value: null };
      case '/': return { fn: (t, x, y) => g(t, x, y) / k, value: null };
      case '>=': return { fn: (t, x, y) => (g(t, x, y) >= k ? 1 : 0), value: null };
      case '<': return { fn: (t, x, y) => (g(t, x, y) < k ? 1 : 0), value: null };
    }
  }
  if (a.value !== null) {
    const k = a.value;
    switch (op) {
      case '+': return { fn: (t, x, y) => k + h(t, x, y), value: null };
      case '-': return { fn: (t, x, y) => k - h(t, x, y), value: null };
      case '*': return { fn: (t, x, y) => k * h(t, x, y), value: null };
      case '/': return { fn: (t, x, y) => k / h(t, x, y), value: null };
    }
  }
  switch (op) {
    case '+': return { fn: (t, x, y) => g(t, x, y) + h(t, x, y), value: null };
    case '-': return { fn: (t, x, y) => g(t, x, y) - h(t, x, y), value: null };
    case '*': return { fn: (t, x, y) => g(t, x, y) * h(t, x, y), value: null };
    case '/': return { fn: (t, x, y) => g(t, x, y) / h(t, x, y), value: null };
    case '&&': return { fn: (t, x, y) => (g(t, x, y) !== 0 && h(t, x, y) !== 0 ? 1 : 0), value: null };
    case '||': return { fn: (t, x, y) => (g(t, x, y) !== 0 || h(t, x, y) !== 0 ? 1 : 0), value: null };
    default: return { fn: (t, x, y) => f(g(t, x, y), h(t, x, y)), value: null };
  }
}

const BINARY_FNS: Record<string, (a: number, b: number) => number> = {
  '+': (a, b) => a + b, '-': (a, b) => a - b, '*': (a, b) => a * b, '/': (a, b) => a / b, '^': Math.pow,
  '<': (a, b) => (a < b ? 1 : 0), '<=': (a, b) => (a <= b ? 1 : 0), '>': (a, b) => (a > b ? 1 : 0),
  '>=': (a, b) => (a >= b ? 1 : 0), '==': (a, b) => (a === b ? 1 : 0), '!=': (a, b) => (a !== b ? 1 : 0),
  '&&': (a, b) => (a !== 0 && b !== 0 ? 1 : 0), '||': (a, b) => (a !== 0 || b !== 0 ? 1 : 0),
};
