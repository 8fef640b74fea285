// The parts of clipper-lib 6.4.2 that the adapter uses (the package ships no types).
declare module 'clipper-lib' {
  interface IntPoint {
    X: number;
    Y: number;
  }
  type Path = IntPoint[];
  class PolyNode {
    Contour(): Path;
    Childs(): PolyNode[];
    IsHole(): boolean;
  }
  class PolyTree extends PolyNode {}
  // eslint-disable-next-line @typescript-eslint/no-unused-vars -- declared for typeof below
  class Clipper {
    constructor(initOptions?: number);
    AddPaths(paths: Path[], polyType: number, closed: boolean): boolean;
    Execute(clipType: number, solution: PolyTree, subjFillType: number, clipFillType: number): boolean;
    StrictlySimple: boolean;
    PreserveCollinear: boolean;
  }
  const ClipperLib: {
    Clipper: typeof Clipper;
    PolyTree: typeof PolyTree;
    ClipType: { ctUnion: number };
    PolyType: { ptSubject: number };
    PolyFillType: { pftNonZero: number };
  };
  export default ClipperLib;
}
