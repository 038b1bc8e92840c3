package org.loopstand.bench.cli;

import picocli.CommandLine;
import picocli.CommandLine.Command;

/** {@code ./loopstand bench ...}: measurement commands. */
@Command(name = "bench", mixinStandardHelpOptions = true, subcommands = {BusCommand.class, BusPartCommand.class},
        description = "Measure the rig at scale (see docs/performance.md).")
public final class BenchCli implements Runnable {
    public static void main(String[] args) {
        String[] rest = args.length > 0 && "bench".equals(args[0]) ? java.util.Arrays.copyOfRange(args, 1, args.length) : args;
        System.exit(new CommandLine(new BenchCli()).execute(rest));
    }

    @Override
    public void run() {
        new CommandLine(this).usage(System.out);
    }
}
