/** Boundary types of the render and deliver stages' output: a bulletin, and the receipt of its delivery. */

/** A rendered bulletin for one audience (a team or the national office). */
export interface Bulletin {
  readonly id: string;
  readonly team: string;
  readonly locale: string;
  readonly to: readonly string[];
  readonly subject: string;
  readonly html: string;
  readonly text: string;
  readonly attachments: readonly {
    readonly cid: string;
    readonly filename: string;
    readonly contentType: string;
    readonly content: Uint8Array;
  }[];
}

/** Result of delivering one bulletin to one recipient. */
export interface DeliveryReceipt {
  readonly bulletinId: string;
  readonly recipient: string;
  readonly status: 'sent' | 'outbox' | 'failed';
  readonly detail: string;
  readonly at: string;
}
