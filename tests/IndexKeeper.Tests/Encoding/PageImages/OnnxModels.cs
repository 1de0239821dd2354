using System.Runtime.InteropServices;

namespace IndexKeeper.Tests.Encoding.PageImages;

/// <summary>
/// Small ONNX graphs written by hand with the field numbers of onnx/onnx.proto (ONNX IR specification):
/// ModelProto ir_version 1, graph 7, opset_import 8; OperatorSetIdProto domain 1, version 2; GraphProto
/// node 1, name 2, initializer 5, input 11, output 12; NodeProto input 1, output 2, name 3, op_type 4,
/// attribute 5; AttributeProto name 1, i 3, ints 8, type 20 (INT 2, INTS 7); TensorProto dims 1,
/// data_type 2 (FLOAT 1, INT64 7), name 8, raw_data 9 (fixed-width little-endian); ValueInfoProto name 1,
/// type 2; TypeProto tensor_type 1; TypeProto.Tensor elem_type 1, shape 2; TensorShapeProto dim 1;
/// Dimension dim_value 1, dim_param 2. Operators as the ONNX operator specification defines them
/// (Conv, Reshape, Transpose, Gather, MatMul, Tanh).
/// </summary>
internal static class OnnxModels
{
    private const int FloatType = 1;
    private const int Int64Type = 7;

    /// <summary>
    /// The page graph of the tests: a convolution with a <paramref name="patch"/>×<paramref name="patch"/>
    /// kernel and the same stride cuts [1, 3, height, width] pixels into patches and projects each to
    /// <paramref name="dimensions"/> (weights [d, 3, p, p], bias [d]); reshape to [1, d, n] and transpose
    /// to [1, n, d], patches in row-major order. Optional extra layers (each MatMul, then Tanh between layers) only add cost, for the benchmark.
    /// </summary>
    public static byte[] PatchGraph(int width, int height, int patch, int dimensions, float[] weights, float[] bias, string input, string output, int extraLayers = 0, int extraWidth = 0)
    {
        var patches = (width / patch) * (height / patch);
        var graph = new ProtoWriter().String(2, "patches");
        var hidden = extraLayers > 0 ? extraWidth : dimensions;
        graph.Message(1, Node("Conv", [input, "conv_weight", "conv_bias"], ["conv"], IntsAttribute("kernel_shape", [patch, patch]), IntsAttribute("strides", [patch, patch])));
        graph.Message(1, Node("Reshape", ["conv", "flat_shape"], ["flat"]));
        graph.Message(1, Node("Transpose", ["flat"], [extraLayers > 0 ? "layer0" : output], IntsAttribute("perm", [0, 2, 1])));
        graph.Message(5, Tensor("conv_weight", [hidden, 3, patch, patch], weights));
        graph.Message(5, Tensor("conv_bias", [hidden], bias));
        graph.Message(5, Int64Tensor("flat_shape", [1, hidden, -1]));
        for (var layer = 0; layer < extraLayers; layer++)
        {
            var last = layer == extraLayers - 1;
            var outWidth = last ? dimensions : hidden;
            var matrix = new float[hidden * outWidth];
            for (var i = 0; i < matrix.Length; i++)
            {
                matrix[i] = (((i * 7919) + layer) % 201 - 100) / (100f * MathF.Sqrt(hidden));
            }

            graph.Message(5, Tensor($"layer{layer}_matrix", [hidden, outWidth], matrix));
            graph.Message(1, Node("MatMul", [$"layer{layer}", $"layer{layer}_matrix"], [last ? output : $"layer{layer}_product"]));
            if (!last)
            {
                graph.Message(1, Node("Tanh", [$"layer{layer}_product"], [$"layer{layer + 1}"]));
            }
        }

        graph.Message(11, Value(input, FloatType, [1, 3, height, width]));
        graph.Message(12, Value(output, FloatType, [1, patches, dimensions]));
        return Model(graph);
    }

    /// <summary>The query graph of the tests: token ids [1, m] (int64) gather rows of an embedding table [vocabulary, d] into [1, m, d].</summary>
    public static byte[] GatherGraph(float[] table, int dimensions, string input, string output)
    {
        var graph = new ProtoWriter().String(2, "tokens");
        graph.Message(1, Node("Gather", ["table", input], [output], IntAttribute("axis", 0)));
        graph.Message(5, Tensor("table", [table.Length / dimensions, dimensions], table));
        graph.Message(11, Value(input, Int64Type, [1, "m"]));
        graph.Message(12, Value(output, FloatType, [1, "m", dimensions]));
        return Model(graph);
    }

    private static byte[] Model(ProtoWriter graph)
    {
        var opset = new ProtoWriter().String(1, string.Empty).Int64(2, 17);
        return new ProtoWriter()
            .Int64(1, 8) // IR version 8 (2021-07-30), which opset 17 needs at least (from memory: ONNX docs/Versioning.md)
            .String(2, "indexkeeper-tests")
            .Message(7, graph)
            .Message(8, opset)
            .ToArray();
    }

    private static ProtoWriter Node(string op, string[] inputs, string[] outputs, params ProtoWriter[] attributes)
    {
        var node = new ProtoWriter();
        foreach (var input in inputs)
        {
            node.String(1, input);
        }

        foreach (var output in outputs)
        {
            node.String(2, output);
        }

        node.String(3, op + "_" + outputs[0]).String(4, op);
        foreach (var attribute in attributes)
        {
            node.Message(5, attribute);
        }

        return node;
    }

    private static ProtoWriter IntsAttribute(string name, long[] values) =>
        new ProtoWriter().String(1, name).PackedInt64(8, values).Int64(20, 7);

    private static ProtoWriter IntAttribute(string name, long value) =>
        new ProtoWriter().String(1, name).Int64(3, value).Int64(20, 2);

    private static ProtoWriter Tensor(string name, long[] dims, float[] data) =>
        new ProtoWriter().PackedInt64(1, dims).Int64(2, FloatType).String(8, name).Bytes(9, MemoryMarshal.AsBytes(data.AsSpan()).ToArray());

    private static ProtoWriter Int64Tensor(string name, long[] data) =>
        new ProtoWriter().PackedInt64(1, [data.Length]).Int64(2, Int64Type).String(8, name).Bytes(9, MemoryMarshal.AsBytes(data.AsSpan()).ToArray());

    // Dimensions: a number is a fixed size, a string a symbolic one.
    private static ProtoWriter Value(string name, int elementType, object[] dims)
    {
        var shape = new ProtoWriter();
        foreach (var dim in dims)
        {
            shape.Message(1, dim is string symbol ? new ProtoWriter().String(2, symbol) : new ProtoWriter().Int64(1, Convert.ToInt64(dim, System.Globalization.CultureInfo.InvariantCulture)));
        }

        var tensorType = new ProtoWriter().Int64(1, elementType).Message(2, shape);
        return new ProtoWriter().String(1, name).Message(2, new ProtoWriter().Message(1, tensorType));
    }
}
