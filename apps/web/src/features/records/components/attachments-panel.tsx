import {
  Box,
  Button,
  Code,
  Heading,
  HStack,
  Image,
  Link,
  SimpleGrid,
  Stack,
  Text,
} from '@chakra-ui/react';
import { ATTACHMENT_MEDIA_TYPES, type CodeAttachment } from '@steadyhand/shared';
import { useRef } from 'react';
import { ErrorMessage } from '../../../components/ui/error-message';
import { formatBytes, formatDateTime } from '../../../lib/format';
import { attachmentContentHref, useAttachments, useUploadAttachment } from '../api/records-api';

const TYPE_WORDS: Record<string, string> = {
  'image/png': 'PNG image',
  'image/jpeg': 'JPEG photo',
  'image/webp': 'WebP image',
  'application/pdf': 'PDF',
};

function AttachmentCard({ attachment }: { attachment: CodeAttachment }) {
  const href = attachmentContentHref(attachment.id);
  const isImage = attachment.mediaType.startsWith('image/');
  return (
    <Stack
      as="li"
      gap="2"
      borderWidth="1px"
      borderRadius="l2"
      p="3"
      bg="bg.panel"
      data-testid="attachment"
    >
      {isImage ? (
        <Link
          href={href}
          target="_blank"
          rel="noopener"
          aria-label={`Open ${attachment.filename} full size`}
        >
          <Image
            src={href}
            alt={`Preview of ${attachment.filename}`}
            maxH="10rem"
            w="full"
            objectFit="contain"
            bg="bg.muted"
            borderRadius="l1"
            data-testid="attachment-preview"
          />
        </Link>
      ) : (
        <Box
          bg="bg.muted"
          borderRadius="l1"
          p="4"
          textAlign="center"
          aria-hidden="true"
          fontWeight="bold"
        >
          PDF
        </Box>
      )}
      <Link href={href} target="_blank" rel="noopener" fontWeight="bold" wordBreak="break-all">
        {attachment.filename}
      </Link>
      <Text textStyle="sm" color="fg.muted">
        {TYPE_WORDS[attachment.mediaType] ?? attachment.mediaType},{' '}
        {formatBytes(attachment.sizeBytes)}; added {formatDateTime(attachment.uploadedAt)} by{' '}
        {attachment.uploadedBy}
      </Text>
      <Text textStyle="xs">
        SHA-256{' '}
        <Code wordBreak="break-all" data-testid="attachment-digest">
          {attachment.sha256}
        </Code>
      </Text>
    </Stack>
  );
}

/** Monitor strips, photos of paper notes, PDFs from other devices: part of the signed record. */
export function AttachmentsPanel({ codeId, canUpload }: { codeId: string; canUpload: boolean }) {
  const list = useAttachments(codeId);
  const upload = useUploadAttachment(codeId);
  const input = useRef<HTMLInputElement>(null);

  return (
    <Stack as="section" gap="4" aria-labelledby="attachments-heading" data-testid="attachments">
      <Heading as="h2" id="attachments-heading" textStyle="2xl">
        Attachments
      </Heading>
      <Text color="fg.muted">
        Images (PNG, JPEG, WebP) and PDFs. The type is checked from the file itself; each file is
        kept once, by its SHA-256.
      </Text>
      {canUpload ? (
        <HStack gap="3" wrap="wrap">
          <input
            ref={input}
            type="file"
            accept={ATTACHMENT_MEDIA_TYPES.join(',')}
            hidden
            data-testid="attachment-input"
            onChange={(e) => {
              const file = e.currentTarget.files?.[0];
              e.currentTarget.value = '';
              if (file) upload.mutate(file);
            }}
          />
          <Button
            variant="outline"
            size="lg"
            loading={upload.isPending}
            loadingText="Uploading…"
            onClick={() => input.current?.click()}
          >
            Attach a file
          </Button>
        </HStack>
      ) : null}
      {upload.error ? <ErrorMessage title="Not attached" message={upload.error.message} /> : null}
      {list.isPending ? <Text role="status">Loading the attachments…</Text> : null}
      {list.error ? <ErrorMessage message={list.error.message} /> : null}
      {list.data && list.data.length === 0 ? <Text>No attachments.</Text> : null}
      {list.data && list.data.length > 0 ? (
        <SimpleGrid as="ul" columns={{ base: 1, sm: 2, lg: 3 }} gap="4" listStyleType="none">
          {list.data.map((a) => (
            <AttachmentCard key={a.id} attachment={a} />
          ))}
        </SimpleGrid>
      ) : null}
    </Stack>
  );
}
