package org.risetrace.io;

import javax.imageio.stream.ImageInputStreamImpl;

/**
 * An ImageIO input stream over bytes already in memory: the file is read once, hashed, and decoded from the same
 * array without the copying of ImageIO's caching streams.
 */
final class ByteArrayImageInputStream extends ImageInputStreamImpl {
    private final byte[] data;

    ByteArrayImageInputStream(byte[] data) {
        this.data = data;
    }

    @Override
    public int read() {
        bitOffset = 0;
        if (streamPos >= data.length) return -1;
        return data[(int) streamPos++] & 0xFF;
    }

    @Override
    public int read(byte[] b, int off, int len) {
        bitOffset = 0;
        if (len == 0) return 0;
        if (streamPos >= data.length) return -1;
        int n = (int) Math.min(len, data.length - streamPos);
        System.arraycopy(data, (int) streamPos, b, off, n);
        streamPos += n;
        return n;
    }

    @Override
    public long length() {
        return data.length;
    }
}
