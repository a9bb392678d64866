// Public surface of the Foldfolio structure engine.
export * from './report/types';
export * from './model/types';
export * from './api/types';
export * from './experiment';
