package org.loopstand.controller.pulsetest;

import java.util.List;
import java.util.Map;
import org.loopstand.controller.pulsetest.governor.GovernorSpec;
import org.loopstand.controller.pulsetest.programme.PulseProgramme;
import org.loopstand.controller.pulsetest.programme.UnitDeclaration;
import org.loopstand.protocol.message.CommandAck;

/**
 * Everything a run recorded, for evaluation and the run folder.
 *
 * @param unit             unit id
 * @param state            how the run ended
 * @param stopReason       why it was aborted or refused; empty otherwise
 * @param declaration      declared data used (null when refused before telemetry)
 * @param programme        expanded programme (null when refused before expansion)
 * @param startedMs        when the test started waiting for telemetry, epoch ms
 * @param programmeStartMs when the programme's time zero was, epoch ms (−1 if it never started)
 * @param stoppedMs        when the run ended, epoch ms
 * @param telemetry        all telemetry scans received, in order
 * @param frequency        good frequency readings of the unit's area, in order (empty without a governor)
 * @param timings          when each completed step actually ran, in order
 * @param governor         the unit's governor whose answer is removed from the output, or null
 * @param pulses           all pulses sent, in order
 * @param acks             answers by command seq
 * @param notes            remarks (e.g. site file and telemetry disagree, the steadiness found at the start)
 */
public record PulseTestRecord(String unit, RunState state, String stopReason, UnitDeclaration declaration,
        PulseProgramme programme, long startedMs, long programmeStartMs, long stoppedMs, List<TelemetryPoint> telemetry,
        List<FrequencyPoint> frequency, List<StepTiming> timings, GovernorSpec governor, List<SentPulse> pulses,
        Map<Long, CommandAck> acks, List<String> notes) {
    public PulseTestRecord {
        telemetry = List.copyOf(telemetry);
        frequency = List.copyOf(frequency);
        timings = List.copyOf(timings);
        pulses = List.copyOf(pulses);
        acks = Map.copyOf(acks);
        notes = List.copyOf(notes);
    }
}
