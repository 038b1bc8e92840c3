package org.loopstand.protocol.journal;

/**
 * A line the reader could not accept.
 *
 * @param lineNumber  1-based line number
 * @param offsetBytes byte offset of the line's first byte in the file
 * @param reason      what is wrong, in words
 */
public record JournalDamage(long lineNumber, long offsetBytes, String reason) {
}
