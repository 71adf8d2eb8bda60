/** Minimal typings for the parts of typed-function that chronomesh uses (the package ships none). */
declare module 'typed-function' {
  type AnyFunction = (...args: never[]) => unknown;
  interface TypedInstance {
    create(): TypedInstance;
    addType(type: { name: string; test: (x: unknown) => boolean }, beforeObjectTest?: boolean): void;
    <F extends AnyFunction>(name: string, signatures: Record<string, AnyFunction>): F;
  }
  const typed: TypedInstance;
  export default typed;
}
