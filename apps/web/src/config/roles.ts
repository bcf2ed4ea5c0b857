import type { Role } from '@underfoot/core';
import type { Area } from './paths';

/** How each account role is named on screen. */
export const roleLabels: Record<Role, string> = {
  office: 'Office',
  inspector: 'Inspector',
  agent: 'Agent',
  client: 'Buyer or seller',
};

/** The name of each area in navigation and on the "not available" page. */
export const areaLabels: Record<Area, string> = {
  office: 'Office',
  field: "Today's jobs",
  portal: 'Your reports',
};

/** The role inside a sentence: "invited you as an inspector". */
export const roleInSentence: Record<Role, string> = {
  office: 'a member of the office team',
  inspector: 'an inspector',
  agent: 'an agent',
  client: 'a buyer or seller',
};
