// Types for the parts of ml-logistic-regression 2.0.0 (an npm reference implementation, no bundled types)
// that the logistic regression test uses.
declare module 'ml-logistic-regression' {
  import type { Matrix } from 'ml-matrix';
  export default class LogisticRegression {
    constructor(options?: { numSteps?: number; learningRate?: number });
    train(X: Matrix, Y: Matrix): void;
    classifiers: { weights: Matrix }[];
  }
}
