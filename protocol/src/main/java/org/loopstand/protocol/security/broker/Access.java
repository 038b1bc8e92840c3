package org.loopstand.protocol.security.broker;

/** What an identity may do on a topic filter (the Mosquitto ACL words). */
public enum Access {
    READ("read"),
    WRITE("write"),
    READWRITE("readwrite");

    private final String aclWord;

    Access(String aclWord) {
        this.aclWord = aclWord;
    }

    /** @return the word used in a Mosquitto ACL file */
    public String aclWord() {
        return aclWord;
    }

    /** @return whether this access allows publishing */
    public boolean allowsPublish() {
        return this != READ;
    }

    /** @return whether this access allows subscribing and receiving */
    public boolean allowsSubscribe() {
        return this != WRITE;
    }
}
