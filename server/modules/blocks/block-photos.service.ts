import crypto from 'node:crypto';
import { AppError } from '../../lib/errors/app-error';
import { inTransaction } from '../../lib/db/transaction';
import { IMAGE_EXTENSIONS } from '../../lib/storage/image-type';
import { reencodePhoto } from '../../lib/storage/reencode-photo';
import type { ServiceContext } from '../../lib/service-context';
import { Account } from '../accounts/account.entity';
import { Block } from './block.entity';
import { BlockPhoto } from './block-photo.entity';
import { assertCanViewBlock, assertEditable, assertOwnsBlock } from './blocks.policy';
import { photoUrl, signPhotoAccess } from './photo-access';
import { blockFacts } from './blocks.service';
import { MAX_PHOTOS_PER_BLOCK, type BlockPhotoView } from '../../../lib/schemas/block';

// Photos of a block: the owner adds (up to 10, JPEG/PNG/WebP by content) and removes them; whoever may see
// the block may see its photos.

async function ownedEditableBlock(ctx: ServiceContext, caller: Account, blockId: string): Promise<Block> {
  const block = await ctx.ds.manager.findOneBy(Block, { id: blockId });
  assertOwnsBlock(caller, block, await blockFacts(ctx.ds.manager, caller, block));
  assertEditable(block);
  return block;
}

function tooMany(): AppError {
  return AppError.conflict(`A block can have at most ${MAX_PHOTOS_PER_BLOCK} photos; delete one first`, 'too_many_photos');
}

/** Checked before the upload is read, so a stranger's or an eleventh upload is refused without taking 8 MB. */
export async function assertCanAddPhoto(ctx: ServiceContext, caller: Account, blockId: string): Promise<void> {
  await ownedEditableBlock(ctx, caller, blockId);
  if ((await ctx.ds.manager.countBy(BlockPhoto, { blockId })) >= MAX_PHOTOS_PER_BLOCK) throw tooMany();
}

export async function addPhoto(ctx: ServiceContext, caller: Account, blockId: string, file: { buffer: Buffer } | undefined): Promise<BlockPhotoView> {
  if (!file) throw AppError.badRequest('Choose a photo to upload', { photo: 'Choose a photo to upload (form field "photo")' });
  // Stored as sharp writes it anew: upright, no EXIF/GPS, within 2048 px (server/lib/storage/reencode-photo.ts).
  const { bytes, type } = await reencodePhoto(file.buffer, 'photo');
  const fileName = await ctx.photos.save(bytes, IMAGE_EXTENSIONS[type]);
  try {
    const photo = await inTransaction(ctx.ds, async (tx) => {
      // Checked again inside the queue: two uploads in flight must not make eleven.
      const block = await tx.findOneBy(Block, { id: blockId });
      assertOwnsBlock(caller, block, await blockFacts(tx, caller, block));
      assertEditable(block);
      if ((await tx.countBy(BlockPhoto, { blockId })) >= MAX_PHOTOS_PER_BLOCK) throw tooMany();
      const last = await tx.findOne(BlockPhoto, { where: { blockId }, order: { position: 'DESC' } });
      const row = tx.create(BlockPhoto, { id: crypto.randomUUID(), blockId, fileName, mimeType: type, sizeBytes: bytes.length, position: (last?.position ?? 0) + 1 });
      await tx.insert(BlockPhoto, row);
      return tx.findOneByOrFail(BlockPhoto, { id: row.id });
    });
    return {
      id: photo.id,
      url: photoUrl(blockId, photo.id, signPhotoAccess(ctx.tokenSecret, { photoId: photo.id, blockId, viewer: caller })),
      mimeType: photo.mimeType,
      sizeBytes: photo.sizeBytes,
      createdAt: photo.createdAt.toISOString(),
    };
  } catch (err) {
    await ctx.photos.remove(fileName);
    throw err;
  }
}

/** The file of a photo, for a viewer who may see the block (404 otherwise, as for the block itself). */
export async function openPhoto(ctx: ServiceContext, viewerId: string, blockId: string, photoId: string) {
  const viewer = await ctx.ds.manager.findOneBy(Account, { id: viewerId });
  if (!viewer) throw AppError.notFound('Photo');
  const block = await ctx.ds.manager.findOneBy(Block, { id: blockId });
  assertCanViewBlock(viewer, block, await blockFacts(ctx.ds.manager, viewer, block));
  const photo = await ctx.ds.manager.findOneBy(BlockPhoto, { id: photoId, blockId });
  if (!photo) throw AppError.notFound('Photo');
  return { path: ctx.photos.pathOf(photo.fileName), mimeType: photo.mimeType, sizeBytes: photo.sizeBytes };
}

export async function deletePhoto(ctx: ServiceContext, caller: Account, blockId: string, photoId: string): Promise<void> {
  const fileName = await inTransaction(ctx.ds, async (tx) => {
    const block = await tx.findOneBy(Block, { id: blockId });
    assertOwnsBlock(caller, block, await blockFacts(tx, caller, block));
    assertEditable(block);
    const photo = await tx.findOneBy(BlockPhoto, { id: photoId, blockId });
    if (!photo) throw AppError.notFound('Photo');
    await tx.delete(BlockPhoto, { id: photo.id });
    return photo.fileName;
  });
  // After the commit: a crash here leaves an orphan file, never a row pointing at nothing.
  await ctx.photos.remove(fileName);
}
