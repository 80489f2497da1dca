export { Text } from './text';
export { Button } from './button';
export { TextField } from './text-field';
export { Screen } from './screen';
export { Card } from './card';
export { Notice } from './notice';
export { LoadingState, ErrorState, EmptyState } from './states';
export * from './theme';
export { TwoPane } from './two-pane';
