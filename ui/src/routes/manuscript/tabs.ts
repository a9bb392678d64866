import type { ComponentType } from 'react';
import type { IconName } from '@blueprintjs/core';
import type { ManuscriptDto } from '@foldfolio/shared';
import { DiscussionTab } from './DiscussionTab';
import { FiguresTab } from './FiguresTab';
import { MembersTab } from './MembersTab';
import { MethodsTableTab } from './MethodsTableTab';
import { ModelsTab } from './ModelsTab';
import { QualityTab } from './QualityTab';
import { ReviewPackagesTab } from './ReviewPackagesTab';
import { TemplatesTab } from './TemplatesTab';

export interface WorkspaceTab {
  /** the URL segment: /manuscripts/:id/<id> */
  id: string;
  label: string;
  icon: IconName;
  component: ComponentType<{ manuscript: ManuscriptDto }>;
}

/** The workspace tabs in display order; later features replace a component, not this list. */
export const WORKSPACE_TABS: readonly WorkspaceTab[] = [
  { id: 'models', label: 'Models', icon: 'cube', component: ModelsTab },
  { id: 'quality', label: 'Quality', icon: 'pulse', component: QualityTab },
  { id: 'figures', label: 'Figures', icon: 'media', component: FiguresTab },
  { id: 'methods-table', label: 'Methods table', icon: 'th', component: MethodsTableTab },
  { id: 'templates', label: 'Templates', icon: 'git-branch', component: TemplatesTab },
  { id: 'discussion', label: 'Discussion', icon: 'chat', component: DiscussionTab },
  { id: 'review-packages', label: 'Review packages', icon: 'box', component: ReviewPackagesTab },
  { id: 'members', label: 'Members', icon: 'people', component: MembersTab },
];
