import type { GroupRole } from '@shared/api';

/** What each group role may do, in the words shown beside role pickers and invitations. */
export const ROLE_DESCRIPTIONS: Record<GroupRole, string> = {
  owner: 'manages members and the group, edits worksheets',
  author: 'creates and edits worksheets',
  reviewer: 'reads and reviews results',
  reader: 'reads only',
};
