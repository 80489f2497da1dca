import { Column, CreateDateColumn, Entity, PrimaryColumn } from 'typeorm';
import type { ImageType } from '../../lib/storage/image-type';

/** A photo of a block; the bytes are a file in the photo store under `fileName` (random, server-chosen). */
@Entity('block_photos')
export class BlockPhoto {
  @PrimaryColumn('varchar', { length: 36 })
  id: string;

  @Column('varchar', { name: 'block_id', length: 36 })
  blockId: string;

  @Column('varchar', { name: 'file_name', length: 64 })
  fileName: string;

  /** From the file's magic bytes, never from what the uploader declared. */
  @Column('varchar', { name: 'mime_type', length: 20 })
  mimeType: ImageType;

  @Column('integer', { name: 'size_bytes' })
  sizeBytes: number;

  /** Upload order within the block (timestamps tie within a second). */
  @Column('integer')
  position: number;

  @CreateDateColumn({ name: 'created_at', type: Date })
  createdAt: Date;
}
