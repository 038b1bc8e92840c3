package org.loopstand.protocol.codec;

import com.fasterxml.jackson.databind.introspect.AnnotatedMember;
import com.fasterxml.jackson.databind.introspect.JacksonAnnotationIntrospector;
import org.loopstand.protocol.message.OptionalField;

/**
 * Makes every creator property required unless marked {@link OptionalField}. (The global
 * FAIL_ON_MISSING_CREATOR_PROPERTIES cannot be used: it would also refuse absent optional fields.)
 */
final class WireAnnotationIntrospector extends JacksonAnnotationIntrospector {
    private static final long serialVersionUID = 1L;

    @Override
    public Boolean hasRequiredMarker(AnnotatedMember member) {
        return !member.hasAnnotation(OptionalField.class);
    }
}
