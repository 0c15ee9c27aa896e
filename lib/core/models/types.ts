// Shapes of the studio's records as the API returns them; shared by db/, route handlers and the browser.
import type { CheckedModel } from '@/lib/core/engine/checked-model';

export type TemplateId = 'linear-stack' | 'cost-range' | 'formula';
export type CheckState = 'unchecked' | 'signed_off' | 'sent_back';

export interface CheckComment {
  path: string;
  text: string;
}

export interface ModelRecord {
  id: string;
  firmId: string;
  title: string;
  template: TemplateId;
  /** The model a new or duplicated model starts from, before (and independent of) its versions. */
  draft: CheckedModel;
  createdBy: string | null;
  createdByName: string | null;
  createdAt: string;
  updatedBy: string | null;
  updatedByName: string | null;
  updatedAt: string;
  archivedAt: string | null;
}

export interface VersionSummary {
  id: string;
  modelId: string;
  number: number;
  authorId: string | null;
  authorName: string | null;
  createdAt: string;
  note: string | null;
  checkState: CheckState;
  checkerId: string | null;
  checkerName: string | null;
  checkedAt: string | null;
  checkNote: string | null;
  comments: CheckComment[];
}

export interface VersionRecord extends VersionSummary {
  model: CheckedModel;
}

export interface ModelListRow {
  id: string;
  title: string;
  template: TemplateId;
  createdAt: string;
  createdByName: string | null;
  updatedAt: string;
  updatedByName: string | null;
  archivedAt: string | null;
  latestVersion: { number: number; checkState: CheckState; createdAt: string; authorName: string | null } | null;
  /** The live widget, if the model is published, and which version it shows. */
  published: { widgetId: string; versionNumber: number; publishedAt: string } | null;
}

export interface WidgetRecord {
  id: string;
  firmId: string;
  modelId: string;
  modelTitle: string;
  template: TemplateId;
  versionId: string;
  versionNumber: number;
  versionCheckState: CheckState;
  title: string;
  panels: string[];
  headline: string;
  dialIds: string[];
  brandColor: string;
  showLogo: boolean;
  publishedBy: string | null;
  publishedByName: string | null;
  publishedAt: string;
  updatedAt: string;
  unpublishedAt: string | null;
}

/** A live widget with everything a viewer's page or a snapshot needs: the version's model and its sign-off. */
export interface PublishedWidget extends WidgetRecord {
  model: CheckedModel;
  versionCreatedAt: string;
  authorName: string | null;
  checkerName: string | null;
  checkedAt: string | null;
  firmName: string;
}

