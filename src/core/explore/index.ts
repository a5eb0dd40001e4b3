/** The design explorer's core (see docs/explorer.md). */
export * from './exploreTypes';
export * from './exploreInputs';
export * from './exploreSpec';
export * from './exploreCells';
