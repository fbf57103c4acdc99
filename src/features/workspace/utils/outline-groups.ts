// The outline rule lives in shared/model (the drawing import suggests groups with it too).
export { membersGroupByOutline } from '@shared/model/outline-groups';
