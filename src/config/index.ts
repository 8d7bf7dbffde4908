// Public surface of src/config: named exports only, no `export *`.
export {
  type FeedRef,
  type LoadWorkspaceOptions,
  loadWorkspace,
  parseWorkspace,
  type Workspace,
  type WorkspaceGroup,
  type WorkspacePerson,
  type WorkspaceRoom,
} from './load-workspace.ts';
export {
  groupSchema,
  personSchema,
  roomSchema,
  type WorkspaceInput,
  weeklyHoursSchema,
  workspaceSchema,
} from './workspace-schema.ts';
