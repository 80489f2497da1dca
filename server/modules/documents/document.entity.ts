import { Column, CreateDateColumn, Entity, Index, PrimaryColumn } from 'typeorm';

export const DOCUMENT_KINDS = ['grazing-log', 'invoice'] as const;
export type DocumentKind = (typeof DOCUMENT_KINDS)[number];

/**
 * A generated file (a PDF record) kept for a contract or an invoice. Each new rendering is a new version;
 * versions count from 1 per contract (logs) or per invoice, and the partial unique indexes keep that
 * promise when two processes store at once. The bytes live in the file store under `storageKey`.
 */
@Entity('documents')
@Index('uq_documents_log_version', ['kind', 'contractId', 'version'], { unique: true, where: `"kind" = 'grazing-log'` })
@Index('uq_documents_invoice_version', ['kind', 'invoiceId', 'version'], { unique: true, where: `"kind" = 'invoice'` })
export class Document {
  @PrimaryColumn('varchar', { length: 36 })
  id: string;

  @Column('varchar', { length: 20 })
  kind: DocumentKind;

  @Column('varchar', { name: 'contract_id', length: 36 })
  contractId: string;

  /** Set for invoices, null for grazing logs. */
  @Column('varchar', { name: 'invoice_id', length: 36, nullable: true })
  invoiceId: string | null;

  @Column('integer')
  version: number;

  /** Hex SHA-256 of the stored bytes (also the download's ETag). */
  @Column('varchar', { length: 64 })
  sha256: string;

  @Column('integer', { name: 'size_bytes' })
  sizeBytes: number;

  @Column('varchar', { name: 'content_type', length: 100 })
  contentType: string;

  @Column('varchar', { name: 'storage_key', length: 200 })
  storageKey: string;

  @CreateDateColumn({ name: 'created_at', type: Date })
  createdAt: Date;
}
